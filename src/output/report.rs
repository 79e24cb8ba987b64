//! Plain-text reports of the catalog for the librarian's commands (`describe`, `solutes`):
//! the engine finds the records (`Engine::describe_solute`, `Engine::catalog`), these print
//! them, with the engine's one caution text. Written to any `Write` so tests can capture them.

use std::io::{self, Write};

use crate::catalog::{Catalog, Description, citation};
use crate::engine::CAUTION;
use crate::model::{Dataset, FitQuantity, GasFit, GasLaw};
use crate::science::units::TemperatureUnit;

/// Writes the table of solutes: id, name, formula, kind, number of solubility datasets and
/// of Henry's-law records.
pub fn write_solutes(catalog: &Catalog, out: &mut dyn Write) -> io::Result<()> {
    let header = ["id", "name", "formula", "kind", "datasets", "henry"];
    let rows: Vec<[String; 6]> = catalog
        .solutes()
        .iter()
        .map(|s| {
            [
                s.id.clone(),
                s.name.clone(),
                s.formula.clone(),
                s.kind.as_str().to_string(),
                catalog.datasets_of(&s.id).len().to_string(),
                catalog.gas_constants_of(&s.id).len().to_string(),
            ]
        })
        .collect();
    let mut widths = header.map(|h| h.chars().count());
    for row in &rows {
        for (w, cell) in widths.iter_mut().zip(row) {
            *w = (*w).max(cell.chars().count());
        }
    }
    let line = |cells: &[&str]| {
        let mut s = String::new();
        // Text columns left-aligned, the two counts right-aligned.
        for (i, (cell, w)) in cells.iter().zip(widths).enumerate() {
            if i >= 4 {
                s.push_str(&format!("  {cell:>w$}"));
            } else if i == 0 {
                s.push_str(&format!("{cell:<w$}"));
            } else {
                s.push_str(&format!("  {cell:<w$}"));
            }
        }
        s
    };
    writeln!(out, "{}", line(&header))?;
    for row in &rows {
        let cells: Vec<&str> = row.iter().map(String::as_str).collect();
        writeln!(out, "{}", line(&cells))?;
    }
    writeln!(out, "{} solutes", rows.len())
}

fn field(out: &mut dyn Write, label: &str, value: &str) -> io::Result<()> {
    writeln!(out, "  {label:<14} {value}")
}

fn celsius(kelvin: f64) -> String {
    format!("{:.2}", TemperatureUnit::Celsius.from_kelvin(kelvin))
}

fn write_dataset(out: &mut dyn Write, d: &Dataset) -> io::Result<()> {
    writeln!(out)?;
    writeln!(out, "dataset {}", d.key)?;
    let water = if d.phase.water > 0.0 {
        format!(", {} H2O", d.phase.water)
    } else {
        String::new()
    };
    field(
        out,
        "phase",
        &format!("{} ({}{water})", d.phase.formula, d.phase.name),
    )?;
    field(out, "unit", &format!("{} (anhydrous solute)", d.unit))?;
    if let Some((low, high)) = d.stable_range {
        let t = &d.temperature_unit;
        field(out, "stable", &format!("from {low} {t} to {high} {t}"))?;
    }
    field(out, "provenance", d.provenance.as_str())?;
    field(out, "review", d.review.as_str())?;
    field(out, "source", &d.source)?;
    if let Some(note) = &d.note {
        field(out, "note", note)?;
    }
    let t_head = format!("T ({})", d.temperature_unit);
    let v_head = format!("value ({})", d.unit);
    let (tw, vw) = (t_head.len().max(8), v_head.len().max(10));
    writeln!(
        out,
        "    {t_head:>tw$}  {v_head:>vw$}  {:>11}  {:>8}  {:>11}",
        "uncertainty", "T (K)", "mass frac."
    )?;
    for p in &d.points {
        let u = p.uncertainty.map(|u| u.to_string()).unwrap_or_default();
        writeln!(
            out,
            "    {:>tw$}  {:>vw$}  {u:>11}  {:>8.2}  {:>11.5}",
            p.temperature_reported, p.value_reported, p.temperature_k, p.mass_fraction
        )?;
    }
    Ok(())
}

fn figure(v: Option<f64>, unit: Option<&str>) -> String {
    match v {
        Some(v) => format!("{v} {}", unit.unwrap_or("")).trim_end().to_string(),
        None => "-".to_string(),
    }
}

/// The corroboration checks of a solute's records, then the datasets no check corroborates.
fn write_checks(d: &Description<'_>, out: &mut dyn Write) -> io::Result<()> {
    writeln!(out)?;
    writeln!(out, "corroboration")?;
    for c in &d.checks {
        writeln!(out, "  check {}: {}", c.key, c.verdict.as_str())?;
        field(out, "  kind", &c.kind)?;
        field(out, "  against", &c.reference)?;
        if let Some(other) = &c.other {
            field(out, "  other record", other)?;
        }
        field(out, "  method", &c.method)?;
        let at = c
            .temperature_k
            .map(|t| format!(" at {} C", celsius(t)))
            .unwrap_or_default();
        field(
            out,
            "  figures",
            &format!(
                "reference {}, satline {}{at}",
                figure(c.figure, c.unit.as_deref()),
                figure(c.satline_figure, c.unit.as_deref())
            ),
        )?;
        if c.tolerance.is_some() {
            field(
                out,
                "  tolerance",
                &figure(c.tolerance, c.tolerance_unit.as_deref()),
            )?;
        }
        if let Some(e) = &c.explanation {
            field(out, "  explanation", e)?;
        }
        if let Some(t) = &c.tool {
            field(out, "  run by", t)?;
        }
    }
    for dataset in &d.datasets {
        let passed = d
            .checks
            .iter()
            .any(|c| c.subject == dataset.key && c.verdict == crate::model::Verdict::Pass);
        if !passed {
            writeln!(
                out,
                "  dataset {}: not corroborated (no passing check against an outside reference)",
                dataset.key
            )?;
        }
    }
    writeln!(
        out,
        "  (a check compares with an outside reference; it does not make data reviewed)"
    )
}

/// Writes everything known about one solute: the record, molar mass, every dataset with its
/// phase, unit, provenance, review and points, gas constants, freezing data, and the full
/// citations of their sources.
pub fn write_description(d: &Description<'_>, out: &mut dyn Write) -> io::Result<()> {
    let s = d.solute;
    writeln!(out, "{} ({})", s.name, s.id)?;
    field(out, "formula", &s.formula)?;
    field(out, "kind", s.kind.as_str())?;
    field(out, "molar mass", &format!("{:.3} g/mol", s.molar_mass))?;
    if let Some(cation) = &s.cation {
        field(out, "cation", cation)?;
    }
    if let Some(anion) = &s.anion {
        field(out, "anion", anion)?;
    }
    field(out, "ions", &s.ions.to_string())?;
    if !s.synonyms.is_empty() {
        field(out, "synonyms", &s.synonyms.join(", "))?;
    }
    if !s.tags.is_empty() {
        field(out, "tags", &s.tags.join(", "))?;
    }
    if let Some(hazard) = &s.hazard {
        field(out, "hazard", hazard)?;
    }
    for dataset in &d.datasets {
        write_dataset(out, dataset)?;
    }
    for g in &d.gas_constants {
        writeln!(out)?;
        writeln!(out, "Henry's law constant {}", g.key)?;
        match &g.law {
            GasLaw::VantHoff(h) => {
                field(out, "form", "van 't Hoff")?;
                field(out, "value", &format!("{} ({})", h.value, h.convention))?;
                let t_ref = h.reference_temperature_k;
                field(out, "at", &format!("{t_ref} K ({} C)", celsius(t_ref)))?;
                field(out, "d ln H/d(1/T)", &format!("{} K", h.temperature_term_k))?;
            }
            GasLaw::Fit(fit) => {
                let form = match fit.quantity {
                    FitQuantity::Molality => {
                        "ln m = a + b/τ + c ln τ + d τ, τ = T/scale, m in mol/kg"
                    }
                    FitQuantity::MoleFraction => {
                        "ln x = a + b/τ + c ln τ + d τ, τ = T/scale, x mole fraction"
                    }
                };
                let GasFit { a, b, c, d, .. } = fit;
                field(out, "form", form)?;
                field(
                    out,
                    "terms",
                    &format!(
                        "a = {a}, b = {b}, c = {c}, d = {d}, scale = {} K",
                        fit.scale_k
                    ),
                )?;
                field(
                    out,
                    "pressure",
                    &format!("{} Pa of the gas", fit.reference_pressure_pa),
                )?;
                field(
                    out,
                    "range",
                    &format!("{} C to {} C", celsius(fit.t_min_k), celsius(fit.t_max_k)),
                )?;
            }
        }
        field(out, "provenance", g.provenance.as_str())?;
        field(out, "review", g.review.as_str())?;
        field(out, "source", &g.source)?;
        if let Some(note) = &g.note {
            field(out, "note", note)?;
        }
    }
    for f in &d.freezing {
        writeln!(out)?;
        writeln!(out, "freezing points {}", f.key)?;
        field(out, "provenance", f.provenance.as_str())?;
        field(out, "review", f.review.as_str())?;
        field(out, "source", &f.source)?;
        writeln!(out, "    {:>11}  {:>8}", "mass frac.", "T (C)")?;
        for (w, t) in &f.points {
            writeln!(out, "    {w:>11.5}  {:>8}", celsius(*t))?;
        }
        if let Some((w, t)) = f.eutectic {
            field(
                out,
                "eutectic",
                &format!("mass fraction {w:.5} at {} C", celsius(t)),
            )?;
        }
    }
    if d.datasets.is_empty() && d.gas_constants.is_empty() {
        writeln!(out)?;
        writeln!(out, "no data yet")?;
    } else {
        write_checks(d, out)?;
    }
    if !d.sources.is_empty() {
        writeln!(out)?;
        writeln!(out, "sources")?;
        for source in &d.sources {
            writeln!(out, "  [{}] {}", source.key, citation(source))?;
            if let Some(note) = &source.note {
                writeln!(out, "      {note}")?;
            }
        }
    }
    let from_memory = d
        .datasets
        .iter()
        .map(|x| x.provenance)
        .chain(d.gas_constants.iter().map(|g| g.provenance))
        .chain(d.freezing.iter().map(|f| f.provenance))
        .any(|p| p == crate::model::Provenance::FromMemory);
    writeln!(out)?;
    if from_memory {
        writeln!(
            out,
            "Some values were typed from memory of a printed table and are not yet checked against it."
        )?;
    }
    writeln!(out, "{CAUTION}")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::store::demo;

    // Invented demo data: not reference values.
    const SOLUTE: &str = r#"
id = "demo-salt"
name = "demo salt"
formula = "NaCl"
kind = "salt"
ions = 2
synonyms = ["table demo"]
[[dataset]]
key = "d"
source = "demo"
phase = "NaCl·2H2O"
phase_name = "dihydrate"
unit = "g/100g water"
temperature_unit = "C"
provenance = "from-memory"
review = "unreviewed"
points = [[-5, 10.5, 0.1], [10, 12]]
"#;

    fn catalog() -> Catalog {
        Catalog::from_store(&demo::store(&[("solutes/demo-salt.toml", SOLUTE)])).unwrap()
    }

    #[test]
    fn description_shows_points_and_citation() {
        let c = catalog();
        let d = c.describe("table demo").unwrap();
        let mut out = Vec::new();
        write_description(&d, &mut out).unwrap();
        let text = String::from_utf8(out).unwrap();
        assert!(text.contains("demo salt (demo-salt)"), "{text}");
        assert!(text.contains("NaCl·2H2O (dihydrate, 2 H2O)"), "{text}");
        assert!(text.contains("10.5"), "{text}");
        assert!(
            text.contains("[demo] Nobody, N. Invented demo data. 2026."),
            "{text}"
        );
        assert!(text.contains("typed from memory"), "{text}");
    }

    #[test]
    fn solutes_table_lists_every_solute() {
        let mut out = Vec::new();
        write_solutes(&catalog(), &mut out).unwrap();
        let text = String::from_utf8(out).unwrap();
        assert!(text.starts_with("id "), "{text}");
        assert!(text.contains("demo-salt"), "{text}");
        assert!(text.ends_with("1 solutes\n"), "{text}");
    }
}
