//! Loading: the seed's fingerprint, reading a seed directory from disk, and writing validated
//! contents into an empty database in one transaction.

use rusqlite::{Connection, params};
use sha2::{Digest, Sha256};

use super::super::read::Contents;
use super::super::{StoreError, now_utc, write};
use super::*;

/// A SHA-256 over the seed files (each path and contents, length-prefixed, in path order),
/// as lower-case hex. Identifies the seed a database was built from.
pub fn fingerprint<P: AsRef<str>, C: AsRef<str>>(files: &[(P, C)]) -> String {
    let mut sorted: Vec<(&str, &str)> = files
        .iter()
        .map(|(p, c)| (p.as_ref(), c.as_ref()))
        .collect();
    sorted.sort();
    let mut hasher = Sha256::new();
    for (path, contents) in sorted {
        for part in [path, contents] {
            hasher.update((part.len() as u64).to_le_bytes());
            hasher.update(part.as_bytes());
        }
    }
    hex(&hasher.finalize())
}

pub(crate) fn hex(bytes: &[u8]) -> String {
    use std::fmt::Write as _;
    let mut out = String::with_capacity(bytes.len() * 2);
    for b in bytes {
        let _ = write!(out, "{b:02x}");
    }
    out
}

/// Reads a seed directory from disk as (path relative to `dir`, contents) pairs, every
/// `*.toml` file at any depth, in path order.
pub fn read_seed_dir(dir: &std::path::Path) -> Result<Vec<(String, String)>, StoreError> {
    fn walk(
        root: &std::path::Path,
        dir: &std::path::Path,
        out: &mut Vec<(String, String)>,
    ) -> Result<(), StoreError> {
        let io = |source| StoreError::Io {
            path: dir.to_path_buf(),
            source,
        };
        let mut entries: Vec<_> = std::fs::read_dir(dir)
            .map_err(io)?
            .collect::<Result<_, _>>()
            .map_err(io)?;
        entries.sort_by_key(|e| e.path());
        for entry in entries {
            let path = entry.path();
            if path.is_dir() {
                walk(root, &path, out)?;
            } else if path.extension().and_then(|e| e.to_str()) == Some("toml") {
                let text = std::fs::read_to_string(&path).map_err(|source| StoreError::Io {
                    path: path.clone(),
                    source,
                })?;
                let rel = path
                    .strip_prefix(root)
                    .unwrap_or(&path)
                    .to_string_lossy()
                    .replace('\\', "/");
                out.push((rel, text));
            }
        }
        Ok(())
    }
    let mut out = Vec::new();
    walk(dir, dir, &mut out)?;
    Ok(out)
}

/// Writes validated contents into an empty database in one transaction, with the seed's
/// fingerprint in the metadata and one audit row.
pub(crate) fn write(
    conn: &mut Connection,
    contents: &Contents,
    fingerprint: &str,
    files: usize,
) -> Result<SeedSummary, StoreError> {
    // Dropping `tx` without commit (on any `?` below) rolls everything back.
    let tx = conn.transaction_with_behavior(rusqlite::TransactionBehavior::Immediate)?;
    {
        for s in &contents.sources {
            write::upsert_source(&tx, s)?;
        }
        for s in &contents.solutes {
            write::upsert_solute(&tx, s)?;
        }
        for d in &contents.datasets {
            write::replace_dataset(&tx, d, &mut || {})?;
        }
        for g in &contents.gas_constants {
            write::replace_gas_constant(&tx, g)?;
        }
        for f in &contents.freezing {
            write::replace_freezing(&tx, f)?;
        }
        for d in &contents.densities {
            super::super::density::replace(&tx, d)?;
        }
        for c in &contents.checks {
            crate::store::corroboration::replace_check(&tx, c)?;
        }
        super::super::thermo_rows::write(&tx, &contents.thermochemistry)?;

        let mut set_meta = tx.prepare_cached(
            "INSERT INTO metadata (key, value) VALUES (?1, ?2)
             ON CONFLICT (key) DO UPDATE SET value = excluded.value",
        )?;
        set_meta.execute(params!["seed_fingerprint", fingerprint])?;
        set_meta.execute(params![
            "built_by",
            concat!("satline ", env!("CARGO_PKG_VERSION"))
        ])?;
        set_meta.execute(params!["built_at", now_utc()])?;

        let after = serde_json::json!({
            "files": files,
            "fingerprint": fingerprint,
            "sources": contents.sources.len(),
            "solutes": contents.solutes.len(),
            "datasets": contents.datasets.len(),
        });
        tx.execute(
            "INSERT INTO audit (time, actor, action, entity, before, after) VALUES (?1, ?2, ?3, ?4, NULL, ?5)",
            params![now_utc(), "seed", "load-seed", "seed", after.to_string()],
        )?;
    }
    tx.commit()?;
    Ok(SeedSummary {
        sources: contents.sources.len(),
        solutes: contents.solutes.len(),
        datasets: contents.datasets.len(),
        points: contents.datasets.iter().map(|d| d.points.len()).sum(),
        gas_constants: contents.gas_constants.len(),
        freezing: contents.freezing.len(),
        fingerprint: fingerprint.to_string(),
    })
}
