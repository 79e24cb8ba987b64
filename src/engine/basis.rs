//! The basis of a loading: a loading given for a solute named by a hydrate's formula
//! (`require Na2HPO4·12H2O stays dissolved at 1.8 g/100g water`) counts the hydrate's
//! mass, water of crystallisation included; it is read on that basis, converted to the
//! anhydrous solute the data hold, and the answer says so.

use crate::answer::Answer;
use crate::engine::common::{loading_mass_fraction, value};
use crate::engine::error::EvalError;
use crate::engine::snapshot::Snapshot;
use crate::model::Solute;
use crate::query::{Loading, Name, Options};
use crate::science::formula::parse_formula;
use crate::science::units::{CompositionUnit, hydrate_to_anhydrous};

/// The hydrate named, when `name` is a hydrate formula of `solute` (same anhydrous part,
/// some water of crystallisation): (formula as typed, molecules of water).
pub(crate) fn named_hydrate(name: &Name, solute: &Solute) -> Option<(String, f64)> {
    if !name
        .text
        .chars()
        .any(|c| matches!(c, '·' | '.' | '*' | '•' | '⋅'))
    {
        return None;
    }
    let text = name.text.replace(['.', '*', '•', '⋅'], "·");
    let formula = parse_formula(&text).ok()?;
    let water = formula.hydrate_water();
    let same = (formula.anhydrous_molar_mass() - solute.molar_mass).abs()
        <= 1e-6 * solute.molar_mass.max(1.0);
    (water > 0.0 && same).then_some((text, water))
}

/// The loading as the mass fraction of anhydrous solute, reading it on the basis of the
/// hydrate the solute was named by, if it was: g/100g water as grams of hydrate per 100 g
/// of added water ([`hydrate_to_anhydrous`]); %w/w and w as the hydrate's share of the
/// solution's mass (× M_anhydrous/M_hydrate). Molar units count formula units, the same on
/// either basis, and are read per kg (or mole) of the solution's whole water. The answer
/// says which basis was used.
pub fn loading_on_named_basis(
    snap: &Snapshot,
    name: &Name,
    loading: &Loading,
    solute: &Solute,
    options: &Options,
    answer: &mut Answer,
) -> Result<f64, EvalError> {
    let Some((hydrate, water)) = named_hydrate(name, solute) else {
        return loading_mass_fraction(snap, loading, solute, options, answer);
    };
    let share = solute.molar_mass / (solute.molar_mass + water * 18.015_28);
    let bad = |e: crate::science::ScienceError| EvalError::Unanswerable {
        message: e.to_string(),
        span: loading.span,
    };
    let anhydrous = match loading.unit {
        CompositionUnit::GramsPer100gWater => Loading {
            value: hydrate_to_anhydrous(loading.value, solute.molar_mass, water).map_err(bad)?,
            ..*loading
        },
        CompositionUnit::MassPercent
        | CompositionUnit::MassFraction
        | CompositionUnit::MilligramsPerKilogram
        | CompositionUnit::GramsPerLitre
        | CompositionUnit::MilligramsPerLitre
        | CompositionUnit::MilligramsPerMillilitre
        | CompositionUnit::PercentWeightPerVolume => Loading {
            value: loading.value * share,
            ..*loading
        },
        _ => {
            answer.caveat(format!(
                "named as {hydrate}: a loading in {} counts formula units, the same for the hydrate and {}; read per the solution's whole water",
                loading.unit.symbol(),
                solute.formula
            ));
            return loading_mass_fraction(snap, loading, solute, options, answer);
        }
    };
    answer.caveat(format!(
        "the loading is read on the basis of {hydrate} (its mass, water of crystallisation included): {} {} of {hydrate} is {} {} of {}",
        value(loading.value),
        loading.unit.symbol(),
        value(anhydrous.value),
        loading.unit.symbol(),
        solute.formula
    ));
    loading_mass_fraction(snap, &anhydrous, solute, options, answer)
}
