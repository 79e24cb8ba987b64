//! Validation: every seed record checked and converted to the records the store keeps
//! (kelvin, mass fraction of the anhydrous solute), each fault naming the file and record.

use std::collections::{HashMap, HashSet};

use super::super::StoreError;
use super::super::read::{Contents, FreezingRecord, Pair};
use super::format::*;
use super::*;
use crate::model::{
    Dataset, FitQuantity, FreezingData, GasConstant, GasFit, GasLaw, Phase, Point, Solute,
    SoluteKind, Source, VantHoffLaw,
};
use crate::science::formula::{parse_formula, water_molar_mass};
use crate::science::units::{CompositionUnit, TemperatureUnit};

// ---------------------------------------------------------------------------------------

pub(crate) fn problem(file: &str, record: impl Into<String>, problem: SeedProblem) -> StoreError {
    StoreError::Seed {
        file: file.to_string(),
        record: record.into(),
        problem,
    }
}

pub(crate) fn syntax(file: &str, text: &str, e: &toml::de::Error) -> StoreError {
    let record = match e.span() {
        Some(span) => {
            let before = text.get(..span.start).unwrap_or(text);
            let line = before.matches('\n').count() + 1;
            let column = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
            format!("line {line}, column {column}")
        }
        None => "whole file".to_string(),
    };
    problem(
        file,
        record,
        SeedProblem::Syntax {
            message: e.message().to_string(),
        },
    )
}

/// Refuses `key` when `seen` holds it already (a second record of the same key in one file),
/// and remembers it otherwise; `what` names the kind of key, e.g. `dataset key`.
pub(crate) fn first_use(
    seen: &mut HashSet<String>,
    file: &str,
    record: &str,
    what: &str,
    key: &str,
) -> Result<(), StoreError> {
    if seen.insert(key.to_string()) {
        Ok(())
    } else {
        Err(problem(
            file,
            record,
            SeedProblem::Duplicate {
                what: what.to_string(),
                id: key.to_string(),
            },
        ))
    }
}

/// Names a record of a seed file (`dataset "crc-97"`) after checking that its key is a slug
/// used once in the file; `kind` is the record's TOML table, e.g. `dataset`.
fn keyed_record(
    seen: &mut HashSet<String>,
    file: &str,
    kind: &str,
    key: &str,
) -> Result<String, StoreError> {
    let record = format!("{kind} \"{key}\"");
    check_slug(file, &record, key)?;
    first_use(seen, file, &record, &format!("{kind} key"), key)?;
    Ok(record)
}

pub(super) fn is_slug(s: &str) -> bool {
    !s.is_empty()
        && s.bytes()
            .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'-')
}

pub(crate) fn check_slug(file: &str, record: &str, id: &str) -> Result<(), StoreError> {
    if is_slug(id) {
        Ok(())
    } else {
        Err(problem(
            file,
            record,
            SeedProblem::BadKey { id: id.to_string() },
        ))
    }
}

/// An empty optional text means "not given".
pub(crate) fn optional(s: Option<String>) -> Option<String> {
    s.filter(|s| !s.trim().is_empty())
}

pub(super) fn notes_pressure(note: Option<&str>) -> bool {
    note.is_some_and(|n| n.to_lowercase().contains("pressur"))
}

/// Converts a reported composition to the mass fraction of the anhydrous solute.
///
/// With M the anhydrous molar mass (g/mol) and M_w = 18.015 g/mol for water:
/// `g/100g water` r → w = r / (100 + r); `%w/w` p → w = p / 100; `w` as is;
/// `mol/kg` b → w = b·M / (1000 + b·M); `x` → w = x·M / (x·M + (1 − x)·M_w).
/// These follow from the definitions of the units (common practice).
/// Returns `None` for units that need more than M (per-volume units).
pub fn to_mass_fraction(unit: CompositionUnit, value: f64, molar_mass: f64) -> Option<f64> {
    match unit {
        CompositionUnit::GramsPer100gWater => Some(value / (100.0 + value)),
        CompositionUnit::MassPercent => Some(value / 100.0),
        CompositionUnit::MassFraction => Some(value),
        CompositionUnit::Molality => Some(value * molar_mass / (1000.0 + value * molar_mass)),
        CompositionUnit::MoleFraction => {
            let solute = value * molar_mass;
            Some(solute / (solute + (1.0 - value) * water_molar_mass()))
        }
        _ => None,
    }
}

pub(super) fn composition_unit(
    file: &str,
    record: &str,
    unit: &str,
) -> Result<CompositionUnit, StoreError> {
    match CompositionUnit::from_symbol(unit) {
        Some(u) if u.needs_density() => Err(problem(
            file,
            record,
            SeedProblem::VolumeUnit {
                unit: unit.to_string(),
            },
        )),
        Some(u) if SEED_UNITS.contains(&u) => Ok(u),
        _ => Err(problem(
            file,
            record,
            SeedProblem::UnknownUnit {
                unit: unit.to_string(),
                expected: SEED_UNITS
                    .iter()
                    .map(|u| u.symbol())
                    .collect::<Vec<_>>()
                    .join(", "),
            },
        )),
    }
}

pub(super) fn temperature_unit(
    file: &str,
    record: &str,
    unit: &str,
) -> Result<TemperatureUnit, StoreError> {
    TemperatureUnit::from_symbol(unit).ok_or_else(|| {
        problem(
            file,
            record,
            SeedProblem::UnknownUnit {
                unit: unit.to_string(),
                expected: "C, K, F".to_string(),
            },
        )
    })
}

pub(super) fn number(
    file: &str,
    record: &str,
    what: &str,
    v: &toml::Value,
) -> Result<f64, StoreError> {
    let n = match v {
        toml::Value::Integer(i) => *i as f64,
        toml::Value::Float(f) => *f,
        other => {
            return Err(problem(
                file,
                record,
                SeedProblem::NotNumeric {
                    what: what.to_string(),
                    found: other.to_string(),
                },
            ));
        }
    };
    if n.is_finite() {
        Ok(n)
    } else {
        Err(problem(
            file,
            record,
            SeedProblem::NotNumeric {
                what: what.to_string(),
                found: n.to_string(),
            },
        ))
    }
}

/// Splits a `[a, b]` or `[a, b, c]` array into numbers.
pub(super) fn tuple(
    file: &str,
    record: &str,
    names: &[&str],
    optional_last: bool,
    v: &toml::Value,
) -> Result<Vec<f64>, StoreError> {
    let expected = if optional_last {
        format!(
            "[{}] or [{}]",
            names[..names.len() - 1].join(", "),
            names.join(", ")
        )
    } else {
        format!("[{}]", names.join(", "))
    };
    let items = match v {
        toml::Value::Array(items)
            if items.len() == names.len() || (optional_last && items.len() + 1 == names.len()) =>
        {
            items
        }
        other => {
            return Err(problem(
                file,
                record,
                SeedProblem::MalformedPoint {
                    expected,
                    found: other.to_string(),
                },
            ));
        }
    };
    items
        .iter()
        .zip(names)
        .map(|(item, name)| number(file, record, name, item))
        .collect()
}

pub(super) fn out_of_range(
    file: &str,
    record: &str,
    temperature: f64,
    unit: TemperatureUnit,
    reason: String,
) -> StoreError {
    problem(
        file,
        record,
        SeedProblem::TemperatureOutOfRange {
            temperature,
            unit: unit.symbol().to_string(),
            reason,
        },
    )
}

/// The general liquid-range rule: −55 °C to 100 °C, or above 100 °C with a note of pressure.
pub(super) fn check_liquid(
    file: &str,
    record: &str,
    reported: f64,
    unit: TemperatureUnit,
    kelvin: f64,
    pressurised: bool,
) -> Result<(), StoreError> {
    if kelvin < LOWEST_LIQUID_K {
        return Err(out_of_range(
            file,
            record,
            reported,
            unit,
            "seed data stops at -55 C (218.15 K)".to_string(),
        ));
    }
    if kelvin > BOILING_K && !pressurised {
        return Err(out_of_range(
            file,
            record,
            reported,
            unit,
            "water boils at 100 C under one atmosphere; if the source worked under pressure, say so in the note".to_string(),
        ));
    }
    Ok(())
}

pub(super) fn check_mass_fraction(
    file: &str,
    record: &str,
    value: f64,
    unit: CompositionUnit,
    w: f64,
) -> Result<(), StoreError> {
    if value < 0.0 || !(0.0..1.0).contains(&w) {
        return Err(problem(
            file,
            record,
            SeedProblem::BadValue {
                reason: format!(
                    "{value} {} is not a possible composition of a solution",
                    unit.symbol()
                ),
            },
        ));
    }
    Ok(())
}

/// Linear interpolation of the ice line at mass fraction `w`; `None` outside the table.
pub(super) fn ice_line_at(points: &[(f64, f64)], w: f64) -> Option<f64> {
    points.windows(2).find_map(|pair| {
        let ((w0, t0), (w1, t1)) = (pair[0], pair[1]);
        (w0 <= w && w <= w1 && w1 > w0).then(|| t0 + (t1 - t0) * (w - w0) / (w1 - w0))
    })
}

/// Everything one solute file holds, validated.
pub(super) struct SoluteParts {
    pub(super) file: String,
    pub(super) solute: Solute,
    pub(super) datasets: Vec<Dataset>,
    pub(super) gas_constants: Vec<GasConstant>,
    pub(super) freezing: Option<FreezingRecord>,
}

pub(super) fn parse_sources(file: &str, text: &str) -> Result<Vec<Source>, StoreError> {
    let raw: SourcesFile = toml::from_str(text).map_err(|e| syntax(file, text, &e))?;
    let mut seen = HashSet::new();
    let mut out = Vec::with_capacity(raw.source.len());
    for s in raw.source {
        keyed_record(&mut seen, file, "source", &s.key)?;
        out.push(Source {
            key: s.key,
            kind: s.kind,
            title: s.title,
            authors: s.authors,
            publisher: optional(s.publisher),
            edition: optional(s.edition),
            year: s.year,
            locator: optional(s.locator),
            doi: optional(s.doi),
            isbn: optional(s.isbn),
            url: optional(s.url),
            note: optional(s.note),
        });
    }
    Ok(out)
}

pub(super) fn parse_solute(
    file: &str,
    stem: &str,
    text: &str,
    sources: &HashSet<&str>,
) -> Result<SoluteParts, StoreError> {
    let raw: RawSolute = toml::from_str(text).map_err(|e| syntax(file, text, &e))?;
    let record = format!("solute \"{}\"", raw.id);
    if raw.id != stem {
        return Err(problem(
            file,
            &record,
            SeedProblem::IdMismatch {
                id: raw.id,
                expected: stem.to_string(),
            },
        ));
    }
    check_slug(file, &record, &raw.id)?;
    let formula = parse_formula(&raw.formula).map_err(|e| {
        problem(
            file,
            &record,
            SeedProblem::MalformedFormula {
                formula: raw.formula.clone(),
                reason: e.to_string(),
            },
        )
    })?;
    if formula.hydrate_water() > 0.0 {
        return Err(problem(
            file,
            &record,
            SeedProblem::BadValue {
                reason: format!(
                    "formula \"{}\" includes water of crystallisation; the solute's formula is the anhydrous one, the hydrate goes in a dataset's phase",
                    raw.formula
                ),
            },
        ));
    }
    let molar_mass = formula.molar_mass();
    let ions = match (raw.ions, raw.kind) {
        (Some(0), _) => {
            return Err(problem(
                file,
                &record,
                SeedProblem::BadValue {
                    reason: "ions must be at least 1".to_string(),
                },
            ));
        }
        (Some(n), _) => n,
        (None, SoluteKind::Salt) => {
            return Err(problem(
                file,
                &record,
                SeedProblem::BadValue {
                    reason: "a salt needs `ions` (ions per formula unit)".to_string(),
                },
            ));
        }
        (None, _) => 1,
    };
    let check_source = |record: &str, key: &str| {
        if sources.contains(key) {
            Ok(())
        } else {
            Err(problem(
                file,
                record,
                SeedProblem::UnknownSource {
                    key: key.to_string(),
                },
            ))
        }
    };

    // Freezing data first: the datasets' points are checked against it.
    let freezing = match raw.freezing {
        None => None,
        Some(f) => Some(parse_freezing(file, &raw.id, molar_mass, f, &check_source)?),
    };

    let mut keys = HashSet::new();
    let mut datasets = Vec::with_capacity(raw.dataset.len());
    for d in raw.dataset {
        let record = keyed_record(&mut keys, file, "dataset", &d.key)?;
        check_source(&record, &d.source)?;
        let unit = composition_unit(file, &record, &d.unit)?;
        let t_unit = temperature_unit(file, &record, &d.temperature_unit)?;
        let phase_formula = parse_formula(&d.phase).map_err(|e| {
            problem(
                file,
                &record,
                SeedProblem::MalformedFormula {
                    formula: d.phase.clone(),
                    reason: e.to_string(),
                },
            )
        })?;
        let note = optional(d.note);
        let pressurised = notes_pressure(note.as_deref());
        if d.points.is_empty() {
            return Err(problem(
                file,
                &record,
                SeedProblem::BadValue {
                    reason: "a dataset needs at least one point".to_string(),
                },
            ));
        }
        let stable_range = match &d.stable_range {
            None => None,
            Some(v) => {
                let record = format!("dataset \"{}\", stable_range", d.key);
                let nums = tuple(file, &record, &["t_low", "t_high"], false, v)?;
                if nums[1] <= nums[0] {
                    return Err(problem(
                        file,
                        &record,
                        SeedProblem::NotAscending {
                            what: "the ends of stable_range".to_string(),
                            previous: nums[0],
                            current: nums[1],
                        },
                    ));
                }
                for t in &nums {
                    check_liquid(file, &record, *t, t_unit, t_unit.to_kelvin(*t), pressurised)?;
                }
                Some((nums[0], nums[1]))
            }
        };
        let mut points = Vec::with_capacity(d.points.len());
        for (i, v) in d.points.iter().enumerate() {
            let record = format!("dataset \"{}\", point {}", d.key, i + 1);
            let nums = tuple(
                file,
                &record,
                &["temperature", "value", "uncertainty"],
                true,
                v,
            )?;
            let (t, value) = (nums[0], nums[1]);
            let uncertainty = nums.get(2).copied();
            let kelvin = t_unit.to_kelvin(t);
            if let Some(prev) = points.last().map(|p: &Point| p.temperature_reported)
                && t <= prev
            {
                return Err(problem(
                    file,
                    &record,
                    SeedProblem::NotAscending {
                        what: "temperatures".to_string(),
                        previous: prev,
                        current: t,
                    },
                ));
            }
            check_liquid(file, &record, t, t_unit, kelvin, pressurised)?;
            if let Some((low, high)) = stable_range
                && !(low <= t && t <= high)
            {
                return Err(out_of_range(
                    file,
                    &record,
                    t,
                    t_unit,
                    format!("outside the dataset's stable_range [{low}, {high}]"),
                ));
            }
            let w = to_mass_fraction(unit, value, molar_mass).unwrap_or(f64::NAN);
            check_mass_fraction(file, &record, value, unit, w)?;
            if uncertainty.is_some_and(|u| u < 0.0) {
                return Err(problem(
                    file,
                    &record,
                    SeedProblem::BadValue {
                        reason: "an uncertainty cannot be negative".to_string(),
                    },
                ));
            }
            if let Some(f) = &freezing {
                check_frozen(file, &record, t, t_unit, kelvin, w, &f.data)?;
            }
            points.push(Point {
                temperature_reported: t,
                temperature_k: kelvin,
                value_reported: value,
                mass_fraction: w,
                uncertainty,
            });
        }
        datasets.push(Dataset {
            key: format!("{}/{}", raw.id, d.key),
            solute: raw.id.clone(),
            solvent: "water".to_string(),
            phase: Phase {
                water: phase_formula.hydrate_water(),
                formula: d.phase,
                name: d.phase_name,
            },
            source: d.source,
            unit: unit.symbol().to_string(),
            temperature_unit: t_unit.symbol().to_string(),
            provenance: d.provenance,
            review: d.review,
            retired: d.retired,
            note,
            points,
            stable_range,
            stable_range_k: stable_range.map(|(l, h)| (t_unit.to_kelvin(l), t_unit.to_kelvin(h))),
        });
    }

    if !raw.henry.is_empty() && raw.kind != SoluteKind::Gas {
        return Err(problem(
            file,
            format!("henry \"{}\"", raw.henry[0].key),
            SeedProblem::BadValue {
                reason: "Henry's-law records belong to gases (kind = \"gas\")".to_string(),
            },
        ));
    }
    let mut henry_keys = HashSet::new();
    let mut gas_constants = Vec::with_capacity(raw.henry.len());
    for h in raw.henry {
        let record = keyed_record(&mut henry_keys, file, "henry", &h.key)?;
        check_source(&record, &h.source)?;
        gas_constants.push(parse_henry(file, &record, &raw.id, h)?);
    }

    let solute = Solute {
        id: raw.id,
        name: raw.name,
        formula: raw.formula,
        kind: raw.kind,
        molar_mass,
        synonyms: raw.synonyms,
        tags: raw.tags,
        cation: optional(raw.cation),
        anion: optional(raw.anion),
        ions,
        hazard: optional(raw.hazard),
    };
    Ok(SoluteParts {
        file: file.to_string(),
        solute,
        datasets,
        gas_constants,
        freezing,
    })
}

pub(super) fn check_frozen(
    file: &str,
    record: &str,
    t: f64,
    unit: TemperatureUnit,
    kelvin: f64,
    w: f64,
    freezing: &FreezingData,
) -> Result<(), StoreError> {
    if kelvin >= ICE_K {
        return Ok(());
    }
    if let Some((_, eutectic_k)) = freezing.eutectic
        && kelvin < eutectic_k - FREEZING_TOLERANCE_K
    {
        return Err(out_of_range(
            file,
            record,
            t,
            unit,
            format!(
                "below the eutectic ({:.2} C) the solution is frozen",
                eutectic_k - ICE_K
            ),
        ));
    }
    if let Some(ice_k) = ice_line_at(&freezing.points, w)
        && kelvin < ice_k - FREEZING_TOLERANCE_K
    {
        return Err(out_of_range(
            file,
            record,
            t,
            unit,
            format!(
                "a solution of this composition freezes at {:.2} C (freezing data)",
                ice_k - ICE_K
            ),
        ));
    }
    Ok(())
}

pub(super) fn parse_freezing(
    file: &str,
    solute: &str,
    molar_mass: f64,
    f: RawFreezing,
    check_source: &dyn Fn(&str, &str) -> Result<(), StoreError>,
) -> Result<FreezingRecord, StoreError> {
    let record = format!("freezing \"{}\"", f.key);
    check_slug(file, &record, &f.key)?;
    check_source(&record, &f.source)?;
    let unit = composition_unit(file, &record, &f.unit)?;
    let t_unit = temperature_unit(file, &record, &f.temperature_unit)?;
    let convert = |record: &str, v: &toml::Value| -> Result<(Pair, Pair), StoreError> {
        let nums = tuple(file, record, &["composition", "temperature"], false, v)?;
        let (c, t) = (nums[0], nums[1]);
        let w = to_mass_fraction(unit, c, molar_mass).unwrap_or(f64::NAN);
        check_mass_fraction(file, record, c, unit, w)?;
        let kelvin = t_unit.to_kelvin(t);
        if kelvin < LOWEST_LIQUID_K {
            return Err(out_of_range(
                file,
                record,
                t,
                t_unit,
                "seed data stops at -55 C (218.15 K)".to_string(),
            ));
        }
        // A dissolved solute lowers the freezing point; a few hundredths of rounding are fine.
        if kelvin > ICE_K + 0.05 {
            return Err(out_of_range(
                file,
                record,
                t,
                t_unit,
                "an aqueous solution freezes at or below 0 C".to_string(),
            ));
        }
        Ok(((c, t), (w, kelvin)))
    };
    let mut reported = Vec::with_capacity(f.points.len());
    let mut canonical = Vec::with_capacity(f.points.len());
    for (i, v) in f.points.iter().enumerate() {
        let record = format!("freezing \"{}\", point {}", f.key, i + 1);
        let (rep, can) = convert(&record, v)?;
        if let Some(&(prev, _)) = reported.last()
            && rep.0 <= prev
        {
            return Err(problem(
                file,
                &record,
                SeedProblem::NotAscending {
                    what: "compositions".to_string(),
                    previous: prev,
                    current: rep.0,
                },
            ));
        }
        reported.push(rep);
        canonical.push(can);
    }
    let (eutectic_reported, eutectic) = match &f.eutectic {
        None => (None, None),
        Some(v) => {
            let (rep, can) = convert(&format!("freezing \"{}\", eutectic", f.key), v)?;
            (Some(rep), Some(can))
        }
    };
    Ok(FreezingRecord {
        data: FreezingData {
            key: format!("{solute}/{}", f.key),
            solute: solute.to_string(),
            source: f.source,
            points: canonical,
            eutectic,
            provenance: f.provenance,
            review: f.review,
        },
        unit: unit.symbol().to_string(),
        temperature_unit: t_unit.symbol().to_string(),
        points_reported: reported,
        eutectic_reported,
        note: optional(f.note),
    })
}

pub(super) fn parse_henry(
    file: &str,
    record: &str,
    solute: &str,
    h: RawHenry,
) -> Result<GasConstant, StoreError> {
    let missing = |field: &str| {
        problem(
            file,
            record,
            SeedProblem::Syntax {
                message: format!("missing field `{field}` for form \"{}\"", h.form),
            },
        )
    };
    let note = optional(h.note.clone());
    let pressurised = notes_pressure(note.as_deref());
    let check_t = |t: f64| check_liquid(file, record, t, TemperatureUnit::Kelvin, t, pressurised);
    let positive = |what: &str, v: f64| {
        if v > 0.0 && v.is_finite() {
            Ok(v)
        } else {
            Err(problem(
                file,
                record,
                SeedProblem::BadValue {
                    reason: format!("{what} must be a positive number, found {v}"),
                },
            ))
        }
    };
    let law = match h.form.as_str() {
        "vant-hoff" => {
            let convention = h.convention.clone().ok_or_else(|| missing("convention"))?;
            if !HENRY_CONVENTIONS.contains(&convention.as_str()) {
                return Err(problem(
                    file,
                    record,
                    SeedProblem::UnknownUnit {
                        unit: convention,
                        expected: HENRY_CONVENTIONS.join(", "),
                    },
                ));
            }
            let value = positive("value", h.value.ok_or_else(|| missing("value"))?)?;
            let reference_temperature_k = h
                .reference_temperature_k
                .ok_or_else(|| missing("reference_temperature_k"))?;
            check_t(reference_temperature_k)?;
            GasLaw::VantHoff(VantHoffLaw {
                convention,
                value,
                reference_temperature_k,
                temperature_term_k: h
                    .temperature_term_k
                    .ok_or_else(|| missing("temperature_term_k"))?,
            })
        }
        form if FitQuantity::from_name(form).is_some() => {
            let t_min_k = h.t_min_k.ok_or_else(|| missing("t_min_k"))?;
            let t_max_k = h.t_max_k.ok_or_else(|| missing("t_max_k"))?;
            check_t(t_min_k)?;
            check_t(t_max_k)?;
            if t_max_k <= t_min_k {
                return Err(problem(
                    file,
                    record,
                    SeedProblem::NotAscending {
                        what: "t_min_k and t_max_k".to_string(),
                        previous: t_min_k,
                        current: t_max_k,
                    },
                ));
            }
            let (a, b, c, d) = (
                h.a.ok_or_else(|| missing("a"))?,
                h.b.ok_or_else(|| missing("b"))?,
                h.c.ok_or_else(|| missing("c"))?,
                h.d.ok_or_else(|| missing("d"))?,
            );
            let scale_k = positive("scale_k", h.scale_k.ok_or_else(|| missing("scale_k"))?)?;
            let reference_pressure_pa = positive(
                "reference_pressure_pa",
                h.reference_pressure_pa
                    .ok_or_else(|| missing("reference_pressure_pa"))?,
            )?;
            GasLaw::Fit(GasFit {
                quantity: FitQuantity::from_name(form).unwrap_or_default(),
                a,
                b,
                c,
                d,
                scale_k,
                reference_pressure_pa,
                t_min_k,
                t_max_k,
            })
        }
        other => {
            return Err(problem(
                file,
                record,
                SeedProblem::Syntax {
                    message: format!(
                        "unknown form \"{other}\"; expected vant-hoff, mole-fraction-fit or molality-fit"
                    ),
                },
            ));
        }
    };
    Ok(GasConstant {
        key: format!("{solute}/{}", h.key),
        solute: solute.to_string(),
        source: h.source,
        law,
        provenance: h.provenance,
        review: h.review,
        note,
    })
}

/// Parses and validates seed files into the records the store keeps, without touching any
/// database. `files` are (path relative to `seed-data/`, contents) pairs.
pub fn parse_seed<P: AsRef<str>, C: AsRef<str>>(files: &[(P, C)]) -> Result<Contents, StoreError> {
    parse_with_known_sources(files, &[])
}

/// As [`parse_seed`], for an import into a database that already holds sources: a dataset
/// may also cite one of `known_sources`, and `sources.toml` may be left out. The returned
/// contents hold only what the files hold.
pub fn parse_with_known_sources<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
    known_sources: &[&str],
) -> Result<Contents, StoreError> {
    parse_with_known(files, known_sources, &[])
}

/// As [`parse_with_known_sources`], where `densities.toml` may also name one of
/// `known_solutes` (solutes already stored).
pub fn parse_with_known<P: AsRef<str>, C: AsRef<str>>(
    files: &[(P, C)],
    known_sources: &[&str],
    known_solutes: &[&str],
) -> Result<Contents, StoreError> {
    let mut densities_file: Option<&str> = None;
    let mut sources_file: Option<(&str, &str)> = None;
    let mut solute_files: Vec<(&str, &str, &str)> = Vec::new();
    let mut check_files: Vec<(&str, &str)> = Vec::new();
    let mut thermo_files: Vec<(&str, &str, &str)> = Vec::new();
    for (path, text) in files {
        let (path, text) = (path.as_ref(), text.as_ref());
        if path == "sources.toml" {
            if sources_file.is_some() {
                return Err(problem(
                    path,
                    "whole file",
                    SeedProblem::Duplicate {
                        what: "file".to_string(),
                        id: path.to_string(),
                    },
                ));
            }
            sources_file = Some((path, text));
        } else if path == super::super::density::FILE {
            densities_file = Some(text);
        } else if let Some(stem) = path
            .strip_prefix("solutes/")
            .and_then(|rest| rest.strip_suffix(".toml"))
            .filter(|stem| !stem.contains('/'))
        {
            solute_files.push((path, stem, text));
        } else if path.starts_with("models/") {
            // Model parameter sets: read by `store::models`, not stored in the database.
            continue;
        } else if crate::store::corroboration::is_check_path(path) {
            check_files.push((path, text));
        } else if let Some(stem) = path
            .strip_prefix(crate::store::thermo_seed::FOLDER)
            .and_then(|rest| rest.strip_suffix(".toml"))
            .filter(|stem| !stem.contains('/'))
        {
            thermo_files.push((path, stem, text));
        } else {
            return Err(problem(path, "whole file", SeedProblem::UnexpectedFile));
        }
    }
    let sources = match sources_file {
        Some((path, text)) => parse_sources(path, text)?,
        // No files at all is an empty reference (a fresh checkout before any data).
        None if (solute_files.is_empty() && densities_file.is_none())
            || !known_sources.is_empty() =>
        {
            Vec::new()
        }
        None => {
            return Err(problem(
                "sources.toml",
                "whole file",
                SeedProblem::MissingSources,
            ));
        }
    };
    let source_keys: HashSet<&str> = sources
        .iter()
        .map(|s| s.key.as_str())
        .chain(known_sources.iter().copied())
        .collect();

    solute_files.sort();
    let mut parts = Vec::with_capacity(solute_files.len());
    // Every id, name and synonym (folded) must point at one solute, or lookup is ambiguous.
    let mut names: HashMap<String, String> = HashMap::new();
    for (path, stem, text) in solute_files {
        let part = parse_solute(path, stem, text, &source_keys)?;
        let s = &part.solute;
        let mut own = HashSet::new();
        for name in std::iter::once(&s.id)
            .chain(std::iter::once(&s.name))
            .chain(&s.synonyms)
        {
            let folded = name.trim().to_lowercase();
            if !own.insert(folded.clone()) {
                continue;
            }
            if let Some(other) = names.insert(folded, s.id.clone()) {
                let what = if other == s.id {
                    "solute id".to_string()
                } else {
                    format!("name (also used by solute \"{other}\")")
                };
                return Err(problem(
                    &part.file,
                    format!("solute \"{}\"", s.id),
                    SeedProblem::Duplicate {
                        what,
                        id: name.clone(),
                    },
                ));
            }
        }
        parts.push(part);
    }

    let mut thermochemistry = crate::model::thermo::Thermochemistry::default();
    thermo_files.sort();
    for (path, stem, text) in thermo_files {
        crate::store::thermo_seed::parse_file(
            path,
            stem,
            text,
            &source_keys,
            &mut thermochemistry,
        )?;
    }
    let densities = match densities_file {
        Some(text) => {
            let solutes: HashSet<&str> = parts
                .iter()
                .map(|p| p.solute.id.as_str())
                .chain(known_solutes.iter().copied())
                .collect();
            super::super::density::parse(text, &source_keys, &solutes)?
        }
        None => Vec::new(),
    };
    let mut contents = Contents {
        sources,
        densities,
        thermochemistry,
        ..Contents::default()
    };
    for part in parts {
        contents.solutes.push(part.solute);
        contents.datasets.extend(part.datasets);
        contents.gas_constants.extend(part.gas_constants);
        contents.freezing.extend(part.freezing);
    }
    contents.checks = crate::store::corroboration::parse_files(
        &check_files,
        &contents,
        !known_sources.is_empty(),
    )?;
    contents.sort();
    Ok(contents)
}
