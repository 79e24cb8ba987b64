//! Per-litre amounts (`g/L`, `mol/L`, `mM`, `%w/v`, …) in answers: the solution's density
//! from Laliberté's model and the reference's coefficients, the temperature the volume is
//! meant at (20 °C unless stated), and the caveats and citations that say so. Without
//! coefficients, or outside their range, a per-litre amount is refused with the reason
//! (but for a volume at most [`DENSITY_SHIFT_K`] from where the coefficients all reach: the
//! density there, said); a density of 1.000 kg/L is used only when the statement asks
//! for it.

use crate::answer::Answer;
use crate::engine::common::{celsius, cite_source, value};
use crate::engine::error::EvalError;
use crate::engine::snapshot::Snapshot;
use crate::model::{Review, Solute};
use crate::query::{Loading, Span};
use crate::science::density::{self, Amount, Coefficients, Refusal, SolveRefusal};
use crate::science::units::{self, CompositionUnit, Context};

/// The temperature a per-litre amount's volume is meant at unless the statement says: 20 °C.
pub const DEFAULT_VOLUME_T_K: f64 = 293.15;

/// How the per-litre amounts of one statement are read.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Volume {
    /// The temperature the volume is meant at, K.
    pub t_k: f64,
    /// True when the statement gave it (else it is the default, and the caveat says so).
    pub stated: bool,
    /// `assuming density 1.000 kg/L`: asked for by the statement.
    pub unit_density: bool,
    /// `reviewed only`: unreviewed coefficients do not count.
    pub reviewed_only: bool,
}

impl Default for Volume {
    fn default() -> Self {
        Volume {
            t_k: DEFAULT_VOLUME_T_K,
            stated: false,
            unit_density: false,
            reviewed_only: false,
        }
    }
}

fn coefficients_of(snap: &Snapshot, solute: &Solute, volume: &Volume) -> Option<Coefficients> {
    snap.catalog
        .density_of(&solute.id)
        .filter(|d| !volume.reviewed_only || d.review == Review::Reviewed)
        .map(|d| Coefficients {
            c: d.c,
            t_min_c: d.t_min_c,
            t_max_c: d.t_max_c,
            w_max: d.w_max,
        })
}

/// Why a density could not be had, in words, for the message of a refusal.
fn reason(refusal: &Refusal, solutes: &[&Solute]) -> String {
    let name = |i: usize| solutes.get(i).map_or("a solute", |s| s.name.as_str());
    match refusal {
        Refusal::Temperature {
            index,
            t_c,
            t_min_c,
            t_max_c,
        } => format!(
            "the density coefficients of {} cover {} C to {} C, not {} C",
            name(*index),
            t_min_c,
            t_max_c,
            value(*t_c)
        ),
        Refusal::MassFraction { index, w, w_max } => format!(
            "the density coefficients of {} cover mass fractions up to {}, and this solution holds {}",
            name(*index),
            value(*w_max),
            value(*w)
        ),
        Refusal::Composition { total } => format!(
            "the solutes would be {} of the solution's mass",
            value(*total)
        ),
        Refusal::Water(e) => format!("pure water's density: {e}"),
    }
}

/// How far (K) from the volume's temperature a solution's density may be read where its
/// solutes' density coefficients do not all reach that temperature: over 10 K pure water's
/// density changes by less than 0.75 % anywhere from 0 C to 100 C (Kell 1975: 0.26 % from
/// 20 C to 30 C, 0.72 % from 90 C to 100 C), a part of a per-litre amount the answer says.
pub const DENSITY_SHIFT_K: f64 = 10.0;

/// Where the coefficient sets `sets` do not all reach `t_k` but all reach a temperature at
/// most `max_shift_k` away: that nearest temperature, K. `None` when they reach `t_k` (or
/// share no temperature, or only farther away).
pub(crate) fn nearest_density_temperature(
    sets: &[Coefficients],
    t_k: f64,
    max_shift_k: f64,
) -> Option<f64> {
    let to_k = |c: f64| units::TemperatureUnit::Celsius.to_kelvin(c);
    let lo = sets
        .iter()
        .map(|c| to_k(c.t_min_c))
        .fold(f64::NEG_INFINITY, f64::max);
    let hi = sets
        .iter()
        .map(|c| to_k(c.t_max_c))
        .fold(f64::INFINITY, f64::min);
    if sets.is_empty() || lo > hi {
        return None;
    }
    let nearest = t_k.clamp(lo, hi);
    (nearest != t_k && (nearest - t_k).abs() <= max_shift_k).then_some(nearest)
}

/// The coefficient sets of `solutes` (as [`density_with`] reads them), where every one has a
/// set.
pub(crate) fn coefficient_sets(
    snap: &Snapshot,
    solutes: &[&Solute],
    volume: &Volume,
) -> Option<Vec<Coefficients>> {
    solutes
        .iter()
        .map(|s| coefficients_of(snap, s, volume))
        .collect()
}

/// The density of a solution of `solutes` at mass fractions `ws`, g/mL, or why not.
pub(crate) fn density_of(
    snap: &Snapshot,
    solutes: &[&Solute],
    ws: &[f64],
    volume: &Volume,
) -> Result<f64, String> {
    density_with(snap, solutes, ws, volume, density::solution_density)
}

/// A density function of the model: kelvin and (mass fraction, coefficients) to kg/m³.
type DensityModel = fn(f64, &[(f64, &Coefficients)]) -> Result<f64, Refusal>;

/// [`density_of`] with the model's function given: the checked one, or
/// [`density::iterate_density`] for the iterates of a composition solve.
fn density_with(
    snap: &Snapshot,
    solutes: &[&Solute],
    ws: &[f64],
    volume: &Volume,
    model: DensityModel,
) -> Result<f64, String> {
    if volume.unit_density {
        return Ok(1.0);
    }
    let mut sets = Vec::with_capacity(solutes.len());
    for s in solutes {
        match coefficients_of(snap, s, volume) {
            Some(c) => sets.push(c),
            None if volume.reviewed_only && snap.catalog.density_of(&s.id).is_some() => {
                return Err(format!(
                    "the density coefficients of {} are not reviewed",
                    s.name
                ));
            }
            None => {
                return Err(format!(
                    "the reference holds no density coefficients for {}",
                    s.name
                ));
            }
        }
    }
    let components: Vec<(f64, &Coefficients)> = ws.iter().copied().zip(sets.iter()).collect();
    let t_k = nearest_density_temperature(&sets, volume.t_k, DENSITY_SHIFT_K).unwrap_or(volume.t_k);
    model(t_k, &components)
        .map(|kg_per_m3| kg_per_m3 / 1000.0)
        .map_err(|r| reason(&r, solutes))
}

fn refused(unit: CompositionUnit, why: &str, span: Span) -> EvalError {
    EvalError::Unanswerable {
        message: format!(
            "{} is per litre of solution and needs its density, but {why}; use g/100g water, %w/w, mol/kg or x, or add `assuming density 1.000 kg/L`",
            unit.symbol()
        ),
        span,
    }
}

/// Says, once per answer, how per-litre amounts were read: the volume's temperature and the
/// density's source.
fn note(snap: &Snapshot, solutes: &[&Solute], volume: &Volume, answer: &mut Answer) {
    let t = celsius(volume.t_k);
    let at = format!("per-litre amounts are per litre of solution at {t} C");
    // Said once: a recipe read with the default temperature and then shown at that same
    // temperature needs no second sentence.
    if !answer.caveats.iter().any(|c| c.starts_with(&at)) {
        answer.caveat(if volume.stated {
            at
        } else {
            format!("{at} (the default, as no temperature was given for the volume)")
        });
    }
    if volume.unit_density {
        answer.caveat(
            "assuming density 1.000 kg/L, as asked: per-litre amounts are approximate (a real solution is denser than water)",
        );
        return;
    }
    answer.caveat(
        "solution density from Laliberté's model (apparent densities of the solutes, additive; Laliberté & Cooper 2004) with the published coefficients (Laliberté 2009)",
    );
    cite_source(snap, "laliberte-cooper-2004", answer);
    let shifted = coefficient_sets(snap, solutes, volume)
        .and_then(|sets| nearest_density_temperature(&sets, volume.t_k, DENSITY_SHIFT_K));
    if let Some(read_at) = shifted {
        let water = |t_k: f64| crate::science::gas::water_density(t_k).unwrap_or(f64::NAN);
        let change = (water(read_at) / water(volume.t_k) - 1.0).abs() * 100.0;
        let t_c = celsius(volume.t_k);
        let short: Vec<String> = solutes
            .iter()
            .filter(|s| {
                coefficients_of(snap, s, volume)
                    .is_some_and(|c| !(c.t_min_c..=c.t_max_c).contains(&t_c))
            })
            .map(|s| s.name.clone())
            .collect();
        answer.caveat(format!(
            "{}: density coefficients do not reach {t} C; the solution's density at {} C, the nearest temperature they reach, is used for its volume at {t} C (pure water's density differs by {} % between them)",
            crate::text::series(&short, "and"),
            celsius(read_at),
            crate::number::round_significant(change, 2)
        ));
    }
    for s in solutes {
        if let Some(d) = snap.catalog.density_of(&s.id) {
            cite_source(snap, &d.source, answer);
            if d.review == Review::Unreviewed {
                answer.caveat(format!(
                    "{}: density coefficients are unreviewed ({})",
                    s.name,
                    d.provenance.as_str()
                ));
            }
        }
    }
}

/// How one loading of `solute` enters a composition: per mass of solution, per mass of
/// water or per volume. `alone` says whether the solute is the only one (a mole fraction
/// is only read for a single solute).
fn amount(solute: &Solute, loading: &Loading, alone: bool) -> Result<Amount, EvalError> {
    use CompositionUnit::*;
    let unanswerable = |message: String| EvalError::Unanswerable {
        message,
        span: loading.span,
    };
    if let Some(scale) = loading.unit.grams_per_millilitre(solute.molar_mass) {
        if !(loading.value.is_finite() && loading.value >= 0.0) {
            return Err(unanswerable(format!(
                "{} {} is not a possible loading",
                loading.value,
                loading.unit.symbol()
            )));
        }
        return Ok(Amount::PerVolume(loading.value * scale));
    }
    if loading.unit == MoleFraction && !alone {
        return Err(unanswerable(
            "a mole fraction depends on every other solute; give an amount of a mixture per kg water, per litre or as a mass fraction".into(),
        ));
    }
    let w = units::to_mass_fraction(
        loading.value,
        loading.unit,
        &Context::with_molar_mass(solute.molar_mass),
    )
    .map_err(|e| unanswerable(e.to_string()))?;
    Ok(match loading.unit {
        GramsPer100gWater | Molality | MillimolesPerKilogram | MicromolesPerKilogram => {
            Amount::PerWater(w / (1.0 - w))
        }
        _ => Amount::MassFraction(w),
    })
}

/// A solution: its solutes, their mass fractions, and how its per-litre amounts are read.
#[derive(Debug, Clone)]
pub struct Solution<'a> {
    pub solutes: Vec<&'a Solute>,
    /// Mass fraction of each solute in the solution, in the order of `solutes`.
    pub ws: Vec<f64>,
    pub volume: Volume,
}

/// The solution made of several solutes with their loadings, each in any unit; per-litre
/// loadings are read at `volume` with the solution's density (solved together with the
/// composition). The caveats and sources say how.
pub fn solution<'a>(
    snap: &Snapshot,
    parts: &[(&'a Solute, &Loading)],
    volume: &Volume,
    answer: &mut Answer,
) -> Result<Solution<'a>, EvalError> {
    let alone = parts.len() == 1;
    let amounts = parts
        .iter()
        .map(|(s, l)| amount(s, l, alone))
        .collect::<Result<Vec<_>, _>>()?;
    let solutes: Vec<&Solute> = parts.iter().map(|(s, _)| *s).collect();
    let first_volume = parts.iter().find(|(_, l)| l.unit.needs_density());
    let span = parts
        .first()
        .map(|(_, l)| l.span)
        .unwrap_or_default()
        .to(parts.last().map(|(_, l)| l.span).unwrap_or_default());
    // The iterates may pass beyond a solute's fitted range on the way (they start from
    // pure water's density); the composition solved is checked below.
    let iterate = |ws: &[f64]| density_with(snap, &solutes, ws, volume, density::iterate_density);
    let ws = density::mass_fractions(&amounts, iterate).map_err(|e| match e {
        SolveRefusal::Impossible => EvalError::Unanswerable {
            message: "these amounts add up to more solute than a solution can hold".into(),
            span,
        },
        SolveRefusal::Density(why) => {
            let (unit, span) = first_volume
                .map_or((CompositionUnit::GramsPerLitre, span), |(_, l)| {
                    (l.unit, l.span)
                });
            refused(unit, &why, span)
        }
        SolveRefusal::NoConvergence => EvalError::Unanswerable {
            message: "the solution's density and composition could not be solved together".into(),
            span,
        },
    })?;
    if let Some((_, l)) = first_volume {
        density_of(snap, &solutes, &ws, volume).map_err(|why| refused(l.unit, &why, l.span))?;
        note(snap, &solutes, volume, answer);
    }
    Ok(Solution {
        solutes,
        ws,
        volume: *volume,
    })
}

impl Solution<'_> {
    /// The solution's density, g/mL, at its volume temperature, or the refusal of `unit`.
    pub fn density(
        &self,
        snap: &Snapshot,
        unit: CompositionUnit,
        span: Span,
    ) -> Result<f64, EvalError> {
        density_of(snap, &self.solutes, &self.ws, &self.volume)
            .map_err(|why| refused(unit, &why, span))
    }

    /// The amount of solute `index` in `unit`, rounded for an answer (not rounded with
    /// `exact`); a per-litre unit uses the solution's density at its volume temperature.
    pub fn amount(
        &self,
        snap: &Snapshot,
        index: usize,
        unit: CompositionUnit,
        span: Span,
        answer: &mut Answer,
    ) -> Result<f64, EvalError> {
        amount_in(snap, self, index, unit, span, answer).map(value)
    }
}

fn amount_in(
    snap: &Snapshot,
    solution: &Solution,
    index: usize,
    unit: CompositionUnit,
    span: Span,
    answer: &mut Answer,
) -> Result<f64, EvalError> {
    let (solutes, ws, volume) = (&solution.solutes, &solution.ws, &solution.volume);
    let (Some(solute), Some(&w)) = (solutes.get(index), ws.get(index)) else {
        return Err(EvalError::Unanswerable {
            message: "no such solute in the solution".into(),
            span,
        });
    };
    let molar_mass = solute.molar_mass;
    let unanswerable = |message: String| EvalError::Unanswerable { message, span };
    if let Some(scale) = unit.grams_per_millilitre(molar_mass) {
        let rho = solution.density(snap, unit, span)?;
        note(snap, solutes, volume, answer);
        return Ok(rho * w / scale);
    }
    let water = 1.0 - ws.iter().sum::<f64>();
    let ctx = Context::with_molar_mass(molar_mass);
    match unit {
        // Per kg of water: this solute's grams per gram of the solution's water.
        CompositionUnit::GramsPer100gWater
        | CompositionUnit::Molality
        | CompositionUnit::MillimolesPerKilogram
        | CompositionUnit::MicromolesPerKilogram => {
            let r = w / water;
            units::from_mass_fraction(r / (1.0 + r), unit, &ctx)
        }
        CompositionUnit::MoleFraction if solutes.len() > 1 => {
            let moles: f64 = solutes
                .iter()
                .zip(ws)
                .map(|(s, w)| w / s.molar_mass)
                .sum::<f64>()
                + water / units::WATER_MOLAR_MASS;
            Ok((w / molar_mass) / moles)
        }
        _ => units::from_mass_fraction(w, unit, &ctx),
    }
    .map_err(|e| unanswerable(e.to_string()))
}

/// `value` in `from` of `solute` alone in water, in `to`, unrounded: what `convert` answers
/// before rounding. Per-litre units on either side go through the solution's density at
/// `volume` (so a round trip through any pair of units is exact but for the density
/// solve's own tolerance).
pub fn convert_alone(
    snap: &Snapshot,
    solute: &Solute,
    value: f64,
    (from, to): (CompositionUnit, CompositionUnit),
    volume: &Volume,
) -> Result<f64, EvalError> {
    let mut scratch = Answer::new(String::new(), crate::answer::AnswerKind::Convert);
    let loading = Loading {
        value,
        unit: from,
        span: Span::default(),
    };
    let solution = solution(snap, &[(solute, &loading)], volume, &mut scratch)?;
    amount_in(snap, &solution, 0, to, Span::default(), &mut scratch)
}
