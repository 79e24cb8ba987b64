//! Exports of the whole reference: TOML in the seed format (a directory with `sources.toml`
//! and `solutes/<id>.toml`), CSV (one row per point, the import columns) and JSON (every
//! record). Each is a pure function of the stored contents, so an export imported into an
//! empty database (with `--keep-state`) and exported again gives the same bytes.
//!
//! Numbers are written with the shortest decimal that reads back as the same `f64`, so no
//! value drifts through a round trip.

use std::fmt::Write as _;
use std::path::Path;

use super::StoreError;
use super::read::Contents;
use crate::model::{Dataset, GasConstant, GasFit, GasLaw, Solute, Source};

/// What an export writes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ExportFormat {
    Toml,
    Csv,
    Json,
}

impl ExportFormat {
    /// The names `--to` accepts.
    pub const NAMES: [&'static str; 3] = ["toml", "csv", "json"];

    pub fn from_name(name: &str) -> Option<ExportFormat> {
        match name {
            "toml" => Some(ExportFormat::Toml),
            "csv" => Some(ExportFormat::Csv),
            "json" => Some(ExportFormat::Json),
            _ => None,
        }
    }
}

/// A number as TOML, CSV and JSON all read it back exactly: Rust's shortest round-trip
/// decimal, in exponent form only for very large whole numbers (which TOML would otherwise
/// take for an out-of-range integer).
pub fn number(v: f64) -> String {
    if v == 0.0 {
        "0".to_string()
    } else if v.fract() == 0.0 && v.abs() >= 1e15 {
        format!("{v:e}")
    } else {
        format!("{v}")
    }
}

fn text(s: &str) -> String {
    toml::Value::String(s.to_string()).to_string()
}

fn strings(items: &[String]) -> String {
    let parts: Vec<String> = items.iter().map(|s| text(s)).collect();
    format!("[{}]", parts.join(", "))
}

fn local(key: &str) -> &str {
    key.split_once('/').map_or(key, |k| k.1)
}

fn opt(out: &mut String, name: &str, value: &Option<String>) {
    if let Some(v) = value {
        let _ = writeln!(out, "{name} = {}", text(v));
    }
}

fn sources_toml(sources: &[Source]) -> String {
    let mut out = String::from("# Exported by satline: the sources the reference cites.\n");
    for s in sources {
        let _ = writeln!(out, "\n[[source]]");
        let _ = writeln!(out, "key = {}", text(&s.key));
        let _ = writeln!(out, "kind = {}", text(s.kind.as_str()));
        let _ = writeln!(out, "title = {}", text(&s.title));
        let _ = writeln!(out, "authors = {}", text(&s.authors));
        opt(&mut out, "publisher", &s.publisher);
        opt(&mut out, "edition", &s.edition);
        if let Some(y) = s.year {
            let _ = writeln!(out, "year = {y}");
        }
        opt(&mut out, "locator", &s.locator);
        opt(&mut out, "doi", &s.doi);
        opt(&mut out, "isbn", &s.isbn);
        opt(&mut out, "url", &s.url);
        opt(&mut out, "note", &s.note);
    }
    out
}

fn dataset_toml(out: &mut String, d: &Dataset) {
    let _ = writeln!(out, "\n[[dataset]]");
    let _ = writeln!(out, "key = {}", text(local(&d.key)));
    let _ = writeln!(out, "source = {}", text(&d.source));
    let _ = writeln!(out, "phase = {}", text(&d.phase.formula));
    let _ = writeln!(out, "phase_name = {}", text(&d.phase.name));
    let _ = writeln!(out, "unit = {}", text(&d.unit));
    let _ = writeln!(out, "temperature_unit = {}", text(&d.temperature_unit));
    let _ = writeln!(out, "provenance = {}", text(d.provenance.as_str()));
    let _ = writeln!(out, "review = {}", text(d.review.as_str()));
    if d.retired {
        let _ = writeln!(out, "retired = true");
    }
    opt(out, "note", &d.note);
    if let Some((low, high)) = d.stable_range {
        let _ = writeln!(out, "stable_range = [{}, {}]", number(low), number(high));
    }
    let _ = writeln!(out, "points = [");
    for p in &d.points {
        match p.uncertainty {
            Some(u) => {
                let _ = writeln!(
                    out,
                    "  [{}, {}, {}],",
                    number(p.temperature_reported),
                    number(p.value_reported),
                    number(u)
                );
            }
            None => {
                let _ = writeln!(
                    out,
                    "  [{}, {}],",
                    number(p.temperature_reported),
                    number(p.value_reported)
                );
            }
        }
    }
    let _ = writeln!(out, "]");
}

/// A fit's terms by their seed names, in the seed format's order.
fn fit_terms(fit: &GasFit) -> [(&'static str, f64); 8] {
    [
        ("a", fit.a),
        ("b", fit.b),
        ("c", fit.c),
        ("d", fit.d),
        ("scale_k", fit.scale_k),
        ("reference_pressure_pa", fit.reference_pressure_pa),
        ("t_min_k", fit.t_min_k),
        ("t_max_k", fit.t_max_k),
    ]
}

fn henry_toml(out: &mut String, g: &GasConstant) {
    let _ = writeln!(out, "\n[[henry]]");
    let _ = writeln!(out, "key = {}", text(local(&g.key)));
    let _ = writeln!(out, "source = {}", text(&g.source));
    let _ = writeln!(out, "provenance = {}", text(g.provenance.as_str()));
    let _ = writeln!(out, "review = {}", text(g.review.as_str()));
    opt(out, "note", &g.note);
    match &g.law {
        GasLaw::VantHoff(h) => {
            let _ = writeln!(out, "form = \"vant-hoff\"");
            let _ = writeln!(out, "convention = {}", text(&h.convention));
            let _ = writeln!(out, "value = {}", number(h.value));
            let _ = writeln!(
                out,
                "reference_temperature_k = {}",
                number(h.reference_temperature_k)
            );
            let _ = writeln!(out, "temperature_term_k = {}", number(h.temperature_term_k));
        }
        GasLaw::Fit(fit) => {
            let _ = writeln!(out, "form = \"{}\"", fit.quantity.as_str());
            for (name, v) in fit_terms(fit) {
                let _ = writeln!(out, "{name} = {}", number(v));
            }
        }
    }
}

fn solute_toml(contents: &Contents, s: &Solute) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "id = {}", text(&s.id));
    let _ = writeln!(out, "name = {}", text(&s.name));
    let _ = writeln!(out, "formula = {}", text(&s.formula));
    let _ = writeln!(out, "kind = {}", text(s.kind.as_str()));
    if !s.synonyms.is_empty() {
        let _ = writeln!(out, "synonyms = {}", strings(&s.synonyms));
    }
    if !s.tags.is_empty() {
        let _ = writeln!(out, "tags = {}", strings(&s.tags));
    }
    opt(&mut out, "cation", &s.cation);
    opt(&mut out, "anion", &s.anion);
    let _ = writeln!(out, "ions = {}", s.ions);
    opt(&mut out, "hazard", &s.hazard);
    for d in contents.datasets.iter().filter(|d| d.solute == s.id) {
        dataset_toml(&mut out, d);
    }
    for g in contents.gas_constants.iter().filter(|g| g.solute == s.id) {
        henry_toml(&mut out, g);
    }
    if let Some(f) = contents.freezing.iter().find(|f| f.data.solute == s.id) {
        let _ = writeln!(out, "\n[freezing]");
        let _ = writeln!(out, "key = {}", text(local(&f.data.key)));
        let _ = writeln!(out, "source = {}", text(&f.data.source));
        let _ = writeln!(out, "provenance = {}", text(f.data.provenance.as_str()));
        let _ = writeln!(out, "review = {}", text(f.data.review.as_str()));
        let _ = writeln!(out, "unit = {}", text(&f.unit));
        let _ = writeln!(out, "temperature_unit = {}", text(&f.temperature_unit));
        opt(&mut out, "note", &f.note);
        let _ = writeln!(out, "points = [");
        for (c, t) in &f.points_reported {
            let _ = writeln!(out, "  [{}, {}],", number(*c), number(*t));
        }
        let _ = writeln!(out, "]");
        if let Some((c, t)) = f.eutectic_reported {
            let _ = writeln!(out, "eutectic = [{}, {}]", number(c), number(t));
        }
    }
    out
}

/// The seed-format files of `contents`: (path relative to the export directory, text), in
/// path order.
pub fn to_toml_files(contents: &Contents) -> Vec<(String, String)> {
    let mut files = vec![("sources.toml".to_string(), sources_toml(&contents.sources))];
    for s in &contents.solutes {
        files.push((format!("solutes/{}.toml", s.id), solute_toml(contents, s)));
    }
    if let Some(text) = super::density::to_toml(&contents.densities) {
        files.push((super::density::FILE.to_string(), text));
    }
    files.extend(super::corroboration::to_toml_files(&contents.checks));
    files.extend(super::thermo_seed::to_toml_files(&contents.thermochemistry));
    files
}

/// One CSV row per point, with the columns of [`super::import::csv_columns`].
pub fn to_csv(contents: &Contents) -> Result<String, StoreError> {
    let mut w = csv::Writer::from_writer(Vec::new());
    let io = |e: csv::Error| StoreError::Io {
        path: "CSV export".into(),
        source: std::io::Error::other(e.to_string()),
    };
    w.write_record(super::import::csv_columns()).map_err(io)?;
    for d in &contents.datasets {
        let Some(s) = contents.solutes.iter().find(|s| s.id == d.solute) else {
            continue;
        };
        for p in &d.points {
            w.write_record([
                s.id.as_str(),
                s.formula.as_str(),
                d.phase.formula.as_str(),
                &number(p.temperature_reported),
                d.temperature_unit.as_str(),
                &number(p.value_reported),
                d.unit.as_str(),
                d.source.as_str(),
                &p.uncertainty.map(number).unwrap_or_default(),
                s.name.as_str(),
                s.kind.as_str(),
                &s.ions.to_string(),
                d.phase.name.as_str(),
                local(&d.key),
                d.provenance.as_str(),
                d.review.as_str(),
                if d.retired { "true" } else { "false" },
                d.note.as_deref().unwrap_or(""),
            ])
            .map_err(io)?;
        }
    }
    let bytes = w
        .into_inner()
        .map_err(|e| io(csv::Error::from(e.into_error())))?;
    String::from_utf8(bytes).map_err(|e| StoreError::Io {
        path: "CSV export".into(),
        source: std::io::Error::other(e.to_string()),
    })
}

/// Every record as one pretty-printed JSON object (the shape of [`Contents`]).
pub fn to_json(contents: &Contents) -> Result<String, StoreError> {
    let mut text = serde_json::to_string_pretty(contents).map_err(|e| StoreError::Io {
        path: "JSON export".into(),
        source: std::io::Error::other(e.to_string()),
    })?;
    text.push('\n');
    Ok(text)
}

fn write_file(path: &Path, text: &str) -> Result<(), StoreError> {
    if let Some(dir) = path.parent().filter(|d| !d.as_os_str().is_empty()) {
        std::fs::create_dir_all(dir).map_err(|source| StoreError::Io {
            path: dir.to_path_buf(),
            source,
        })?;
    }
    std::fs::write(path, text).map_err(|source| StoreError::Io {
        path: path.to_path_buf(),
        source,
    })
}

/// Writes an export: for TOML, a directory `out` (which must be empty or new unless
/// `force`); for CSV and JSON, the file `out`. Returns the paths written.
pub fn export(
    contents: &Contents,
    format: ExportFormat,
    out: &Path,
    force: bool,
) -> Result<Vec<std::path::PathBuf>, StoreError> {
    match format {
        ExportFormat::Toml => {
            if !force
                && out.is_dir()
                && std::fs::read_dir(out)
                    .map(|mut d| d.next().is_some())
                    .unwrap_or(false)
            {
                return Err(StoreError::NotEmptyDirectory {
                    path: out.to_path_buf(),
                });
            }
            let mut written = Vec::new();
            for (name, text) in to_toml_files(contents) {
                let path = out.join(name);
                write_file(&path, &text)?;
                written.push(path);
            }
            Ok(written)
        }
        ExportFormat::Csv | ExportFormat::Json => {
            if out.exists() && !force {
                return Err(StoreError::AlreadyExists {
                    path: out.to_path_buf(),
                });
            }
            let text = if format == ExportFormat::Csv {
                to_csv(contents)?
            } else {
                to_json(contents)?
            };
            write_file(out, &text)?;
            Ok(vec![out.to_path_buf()])
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_read_back_exactly() {
        for v in [0.0, -0.0, 20.0, 31.6, 1.3e-5, 1e20, -21.1, 0.1 + 0.2] {
            let s = number(v);
            let back: toml::Value = toml::from_str(&format!("x = {s}")).unwrap();
            let back = match back.get("x").unwrap() {
                toml::Value::Integer(i) => *i as f64,
                toml::Value::Float(f) => *f,
                other => panic!("{other:?}"),
            };
            assert_eq!(back, if v == 0.0 { 0.0 } else { v }, "{s}");
        }
    }
}
