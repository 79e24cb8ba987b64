//! Helpers every statement uses: finding a solute and its curve, converting loadings,
//! citing the data an answer rests on, and turning science errors into messages in °C.

use crate::answer::{Answer, AnswerKind, Basis, Row, SourceRef};
use crate::engine::error::EvalError;
use crate::engine::per_litre::{self, Volume};
use crate::engine::snapshot::{BuiltCurve, Snapshot};
use crate::model::{Dataset, Provenance, Review, Solute, SoluteKind};
use crate::number::shown;
use crate::query::{Loading, Name, Options, Span, Temperatures, UnitChoice};
use crate::science::ScienceError;
use crate::science::units::{self, CompositionUnit, Context};

/// Kelvin to °C, rounded to 0.01 K (the precision of the inversions).
pub fn celsius(t_k: f64) -> f64 {
    crate::number::hundredths_of_degree(t_k - 273.15)
}

/// A temperature (K) in °C for a message: to 0.01 K, or in exponent form when it is far
/// beyond any liquid (so `1e308 C` is not written out in 309 digits).
pub fn celsius_text(t_k: f64) -> String {
    let c = celsius(t_k);
    if c.abs() >= 1e6 {
        format!("{c:e}")
    } else {
        c.to_string()
    }
}

pub use crate::number::value;

/// Finds a solute by what was typed, or says what was meant.
pub fn resolve<'a>(snap: &'a Snapshot, name: &Name) -> Result<&'a Solute, EvalError> {
    snap.catalog
        .find_solute(&name.text)
        .map_err(|e| EvalError::UnknownSolute {
            message: e.to_string(),
            span: name.span,
        })
}

/// True for a solute that mixes with water in all proportions and has no solubility data:
/// it has no saturation limit (no solid of its own to check; only ice, below 0 °C).
pub fn miscible(snap: &Snapshot, solute: &Solute) -> bool {
    solute.tags.iter().any(|t| t == "miscible") && snap.curve(&solute.id, false).is_none()
}

/// The curve of a solid solute, or why there is none.
pub fn curve_of<'a>(
    snap: &'a Snapshot,
    solute: &Solute,
    name: &Name,
    options: &Options,
) -> Result<&'a BuiltCurve, EvalError> {
    if solute.kind == SoluteKind::Gas {
        return Err(EvalError::NoData {
            message: format!(
                "{} is a gas: its solubility depends on its pressure; ask `dissolved {} at 25 C under air`",
                solute.name, solute.formula
            ),
            span: name.span,
        });
    }
    if miscible(snap, solute) {
        return Err(EvalError::NoData {
            message: format!(
                "{} mixes with water in all proportions (miscible): there is no saturation limit to give",
                solute.name
            ),
            span: name.span,
        });
    }
    snap.curve(&solute.id, options.reviewed_only)
        .ok_or_else(|| EvalError::NoData {
            message: if options.reviewed_only {
                format!("{} has no reviewed solubility data", solute.name)
            } else {
                // The snapshot holds no retired dataset: say what may be the case, and where
                // to see which (a retired or rejected dataset is in the history).
                format!(
                    "{} has no solubility data in use: the reference holds none for it, or its \
                     datasets are retired or rejected (`satline history` shows which)",
                    solute.name
                )
            },
            span: name.span,
        })
}

/// Cites a record's source and, when it was typed from memory, says so: `typed` names the
/// record and what it was typed from (`freezing data typed from memory of the cited table`).
pub fn cite_typed(
    snap: &Snapshot,
    source: &str,
    provenance: Provenance,
    typed: &str,
    solute: &Solute,
    answer: &mut Answer,
) {
    cite_source(snap, source, answer);
    if provenance == Provenance::FromMemory {
        answer.caveat(format!(
            "{}: {typed}, not yet checked against it (from-memory)",
            solute.name
        ));
    }
}

/// Cites a dataset's source and says when it was typed from memory.
pub fn cite_dataset(snap: &Snapshot, dataset: &Dataset, solute: &Solute, answer: &mut Answer) {
    let typed = "data typed from memory of the cited table";
    cite_typed(
        snap,
        &dataset.source,
        dataset.provenance,
        typed,
        solute,
        answer,
    );
}

/// What citing one solute's curve adds to an answer: its sources with their full
/// citations and its caveats, in order.
#[derive(Debug, Clone)]
pub struct Citing {
    /// The solute whose curve it is (a curve is cited for its own solute).
    solute: String,
    sources: Vec<SourceRef>,
    caveats: Vec<String>,
}

/// Adds the sources, provenance caveats and hazard note of the datasets behind a curve.
/// They depend only on the snapshot, so they are worked out (citations formatted,
/// corroboration looked up) the first time a curve is cited and added as they were after;
/// each is added once, as if it were worked out again.
pub fn cite_curve(snap: &Snapshot, built: &BuiltCurve, solute: &Solute, answer: &mut Answer) {
    let citing = built.citing.get_or_init(|| {
        let mut fresh = Answer::new("", AnswerKind::Lookup);
        cite_curve_afresh(snap, built, solute, &mut fresh);
        Citing {
            solute: solute.id.clone(),
            sources: fresh.sources,
            caveats: fresh.caveats,
        }
    });
    if citing.solute != solute.id {
        // Not reached (each curve is its own solute's), but never another solute's caveats.
        cite_curve_afresh(snap, built, solute, answer);
        return;
    }
    for source in &citing.sources {
        if !answer.sources.iter().any(|s| s.key == source.key) {
            answer.sources.push(source.clone());
        }
    }
    for caveat in &citing.caveats {
        if !answer.caveats.contains(caveat) {
            answer.caveats.push(caveat.clone());
        }
    }
}

/// [`cite_curve`] worked out from the catalog.
fn cite_curve_afresh(snap: &Snapshot, built: &BuiltCurve, solute: &Solute, answer: &mut Answer) {
    let datasets = snap.catalog.datasets();
    for &i in &built.datasets {
        let dataset = &datasets[i];
        cite_dataset(snap, dataset, solute, answer);
        if dataset.review == Review::Unreviewed {
            answer.caveat(format!("{}: rests on unreviewed data", solute.name));
        }
    }
    super::corroboration::corroboration_caveat(snap, built, solute, answer);
    hazard(solute, answer);
}

/// Adds one source by key, with its full citation.
pub fn cite_source(snap: &Snapshot, key: &str, answer: &mut Answer) {
    if let Some(position) = snap.catalog.source_position(key) {
        cite_source_at(snap, position, answer);
    }
}

/// [`cite_source`] by the source's position in `Catalog::sources`.
pub fn cite_source_at(snap: &Snapshot, position: usize, answer: &mut Answer) {
    let (Some(source), Some(text)) = (
        snap.catalog.sources().get(position),
        snap.citation_at(position),
    ) else {
        return;
    };
    // A screening cites per solute: the citation is formatted once, in the snapshot.
    answer.cite(&source.key, text);
}

/// The solute's hazard note, when it has one.
pub fn hazard(solute: &Solute, answer: &mut Answer) {
    if let Some(note) = &solute.hazard
        && !note.trim().is_empty()
    {
        answer.caveat(format!(
            "{}: {} Follow the safety data sheet.",
            solute.name,
            note.trim()
        ));
    }
}

/// Caveats for the basis of a number.
pub fn basis_caveat(basis: Basis, answer: &mut Answer) {
    if basis == Basis::Extrapolated {
        answer
            .caveat("extrapolated beyond the data's temperature range, as asked: treat with care");
    }
}

/// The conversion context for a solute (its molar mass; no density).
pub fn context(solute: &Solute) -> Context {
    Context::with_molar_mass(solute.molar_mass)
}

/// How a statement's per-litre amounts are read: at the default volume temperature, with
/// the statement's options.
pub fn volume(options: &Options) -> Volume {
    Volume {
        reviewed_only: options.reviewed_only,
        unit_density: options.assume_unit_density,
        ..Volume::default()
    }
}

/// A loading as the mass fraction of anhydrous solute; a per-litre loading through the
/// solution's density (the answer says so).
pub fn loading_mass_fraction(
    snap: &Snapshot,
    loading: &Loading,
    solute: &Solute,
    options: &Options,
    answer: &mut Answer,
) -> Result<f64, EvalError> {
    if loading.unit.needs_density() {
        let solution = per_litre::solution(snap, &[(solute, loading)], &volume(options), answer)?;
        possible_loading(loading, solution.ws.first().copied().unwrap_or_default())
    } else {
        loading_mass_fraction_by_mass(loading, solute.molar_mass)
    }
}

/// [`loading_mass_fraction`] of a loading in a unit that is not per litre, from the
/// solute's molar mass alone.
pub fn loading_mass_fraction_by_mass(loading: &Loading, molar_mass: f64) -> Result<f64, EvalError> {
    let w = units::to_mass_fraction(
        loading.value,
        loading.unit,
        &Context::with_molar_mass(molar_mass),
    )
    .map_err(|e| per_volume(e, loading.unit, loading.span))?;
    possible_loading(loading, w)
}

/// A loading's mass fraction `w`, refused where no solution holds it.
fn possible_loading(loading: &Loading, w: f64) -> Result<f64, EvalError> {
    if w >= 1.0 {
        return Err(EvalError::Unanswerable {
            message: format!(
                "{} {} is not a possible loading of a solution",
                loading.value,
                loading.unit.symbol()
            ),
            span: loading.span,
        });
    }
    Ok(w)
}

/// A mass fraction in the unit asked for; a per-litre unit through the solution's density
/// (the answer says so).
pub fn in_unit(
    snap: &Snapshot,
    w: f64,
    unit: CompositionUnit,
    solute: &Solute,
    span: Span,
    options: &Options,
    answer: &mut Answer,
) -> Result<f64, EvalError> {
    if unit.needs_density() {
        let solution = per_litre::Solution {
            solutes: vec![solute],
            ws: vec![w],
            volume: volume(options),
        };
        return solution.amount(snap, 0, unit, span, answer);
    }
    units::from_mass_fraction(w, unit, &context(solute))
        .map(value)
        .map_err(|e| per_volume(e, unit, span))
}

/// A row of one solute's amount, in the unit a statement asks for (grams per 100 g of water
/// when it names none; an error points at the unit, or at `otherwise` when none was named):
/// the solute, the value and its unit; the caller adds what the amount is.
pub fn amount_row(
    snap: &Snapshot,
    w: f64,
    asked: Option<UnitChoice<CompositionUnit>>,
    otherwise: Span,
    solute: &Solute,
    options: &Options,
    answer: &mut Answer,
) -> Result<Row, EvalError> {
    let unit = asked.map_or(CompositionUnit::GramsPer100gWater, |u| u.unit);
    let span = asked.map_or(otherwise, |u| u.span);
    let amount = in_unit(snap, w, unit, solute, span, options, answer)?;
    Ok(Row {
        solute: Some(solute.name.clone()),
        value: Some(amount),
        unit: Some(unit.symbol().into()),
        ..Row::default()
    })
}

/// [`in_unit`] in a loading's own unit; an error points at the loading.
pub fn in_loading_unit(
    snap: &Snapshot,
    w: f64,
    loading: &Loading,
    solute: &Solute,
    options: &Options,
    answer: &mut Answer,
) -> Result<f64, EvalError> {
    in_unit(snap, w, loading.unit, solute, loading.span, options, answer)
}

/// A science error on a loading or unit, said in the words of a person asking.
fn per_volume(error: ScienceError, unit: CompositionUnit, span: Span) -> EvalError {
    match error {
        ScienceError::MissingDensity { .. } => EvalError::Unanswerable {
            message: format!(
                "{} is per litre of solution and needs the solution's density, which the reference does not hold; use g/100g water, %w/w, mol/kg or x",
                unit.symbol()
            ),
            span,
        },
        other => EvalError::Unanswerable {
            message: other.to_string(),
            span,
        },
    }
}

/// A science error from evaluating a curve, with temperatures in °C.
pub fn curve_error(error: ScienceError, solute: &Solute, span: Span) -> EvalError {
    match error {
        // Data of one temperature: the same words with or without `extrapolate`.
        ScienceError::OutOfRange {
            t_k,
            t_min_k,
            t_max_k,
        }
        | ScienceError::NoTrend {
            t_k,
            t_min_k,
            t_max_k,
            ..
        } if t_min_k == t_max_k => EvalError::OutOfRange {
            message: format!(
                "{} C is outside the data for {}, which hold one temperature only ({} C): one point gives no trend to extrapolate from",
                celsius_text(t_k),
                solute.name,
                celsius(t_min_k)
            ),
            span,
        },
        ScienceError::OutOfRange {
            t_k,
            t_min_k,
            t_max_k,
        } => EvalError::OutOfRange {
            message: format!(
                "{} C is outside the data for {} ({} C to {} C); add `extrapolate` to go beyond it",
                celsius_text(t_k),
                solute.name,
                celsius(t_min_k),
                celsius(t_max_k)
            ),
            span,
        },
        ScienceError::NoTrend {
            t_k,
            end_k,
            t_min_k,
            t_max_k,
        } => EvalError::OutOfRange {
            message: format!(
                "{} C is beyond the data for {} ({} C to {} C), whose end at {} C is a single point: it gives no trend to extrapolate from",
                celsius_text(t_k),
                solute.name,
                celsius(t_min_k),
                celsius(t_max_k),
                celsius(end_k)
            ),
            span,
        },
        ScienceError::InGap {
            t_k,
            below_k,
            above_k,
        } => EvalError::OutOfRange {
            message: format!(
                "{} C falls between two solid phases of {} with no data ({} C to {} C); add `extrapolate` to bridge it",
                celsius(t_k),
                solute.name,
                celsius(below_k),
                celsius(above_k)
            ),
            span,
        },
        ScienceError::BeyondExtrapolation { t_k, low_k, high_k } => EvalError::OutOfRange {
            message: format!(
                "{} C is beyond what `extrapolate` may reach for {} ({} C to {} C): at most {} K beyond its data, never past the boiling point of water at one atmosphere (100 C) nor below -55 C",
                celsius_text(t_k),
                solute.name,
                celsius(low_k),
                celsius(high_k),
                crate::science::bounds::MAX_EXTRAPOLATION_K
            ),
            span,
        },
        ScienceError::ImpossibleExtrapolation { t_k, w, why } => EvalError::OutOfRange {
            message: format!(
                "{}: extrapolated to {} C the saturated solution would be {} % solute by mass, which {why}; not answered",
                solute.name,
                celsius(t_k),
                shown(w * 100.0, 4)
            ),
            span,
        },
        other => EvalError::Unanswerable {
            message: format!("{}: {other}", solute.name),
            span,
        },
    }
}

/// (low, high) of a temperature or range, K.
pub fn bounds(temperatures: &Temperatures) -> (f64, f64) {
    match temperatures {
        Temperatures::At(t) => (t.kelvin(), t.kelvin()),
        Temperatures::Range(r) => (r.low.kelvin(), r.high.kelvin()),
    }
}

/// The caveat for a curve followed across a change of solid phase, or of a hydrate basis.
pub fn phase_caveat(phase: &str, answer: &mut Answer) {
    if phase.contains('·') {
        answer.caveat(format!(
            "the solid in equilibrium is the hydrate {phase}; values are per anhydrous solute"
        ));
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::Engine;

    /// Citing a curve from what was worked out at its first citation adds exactly what
    /// working it out again adds, to an empty answer and to one already citing others.
    #[test]
    fn a_curve_cited_again_adds_what_it_added_worked_out_afresh() {
        let engine = Engine::open_embedded().unwrap();
        let snap = &engine.snapshot;
        let mut cited = 0;
        for (index, solute) in snap.catalog.solutes().iter().enumerate() {
            for reviewed_only in [false, true] {
                let Some(built) = snap.curve_at(index, reviewed_only) else {
                    continue;
                };
                let mut earlier = Answer::new("", AnswerKind::Lookup);
                earlier.cite("other", "Another source.");
                earlier.caveat("an earlier caveat");
                for start in [Answer::new("", AnswerKind::Lookup), earlier] {
                    let (mut afresh, mut first, mut again) = (start.clone(), start.clone(), start);
                    cite_curve_afresh(snap, built, solute, &mut afresh);
                    cite_curve(snap, built, solute, &mut first);
                    cite_curve(snap, built, solute, &mut again);
                    cite_curve(snap, built, solute, &mut again);
                    assert_eq!(first, afresh, "{}", solute.id);
                    assert_eq!(again, afresh, "{}", solute.id);
                }
                cited += 1;
            }
        }
        assert!(cited > 10, "only {cited} curves cited");
    }
}
