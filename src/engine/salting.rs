//! A gas in a recipe's liquid (`dissolved O2 at 25 C in recipe 0.9 %w/v NaCl`): the
//! recipe's ions salt the gas out ([`crate::science::salting_out`]). The recipe's
//! composition is solved as for any statement about it, each salt split into its ions, and
//! the ions' concentrations per litre read through the recipe's density at the asked
//! temperature.

use crate::answer::Answer;
use crate::engine::common::{celsius, cite_source};
use crate::engine::error::EvalError;
use crate::engine::per_litre::{Volume, coefficient_sets, density_of, nearest_density_temperature};
use crate::engine::snapshot::Snapshot;
use crate::model::{Solute, SoluteKind};
use crate::number::{round_significant, shown};
use crate::query::{Options, Recipe, Span};
use crate::science::activity::ions::electrolyte;
use crate::science::salting_out::{Sechenov, ratio_to_pure_water};

/// The source every salting-out record of the seed cites.
const SOURCE: &str = "weisenberger-schumpe-1996";

/// A gas in a recipe's liquid, against pure water.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct InRecipe {
    /// The gas's concentration (per litre) in the liquid over its concentration in pure
    /// water at the same partial pressure and temperature.
    pub ratio: f64,
    /// The liquid's density, kg/L, as the ions' concentrations were read with it.
    pub density: f64,
    /// The liquid's water, as a mass fraction.
    pub water: f64,
}

/// The gas in `recipe`'s liquid at `t_k` ([`InRecipe`]); says how in `answer`'s caveats and
/// cites the data. `t_span`: where the temperature was written.
pub fn ratio_in(
    snap: &Snapshot,
    recipe: &Recipe,
    gas: &Solute,
    (t_k, t_span): (f64, Span),
    options: &Options,
    answer: &mut Answer,
) -> Result<InRecipe, EvalError> {
    let title = recipe.title();
    let parameters = gas_parameters(snap, gas, &title, recipe.span)?;
    if !parameters.covers(t_k) {
        let range = format!(
            "from {} C to {} C",
            celsius(parameters.t_min_k),
            celsius(parameters.t_max_k)
        );
        if !options.extrapolate {
            return Err(EvalError::OutOfRange {
                message: format!(
                    "the salting-out parameters of {} hold {range}; add `extrapolate` to go beyond them",
                    gas.name
                ),
                span: t_span,
            });
        }
        answer.caveat(format!(
            "the salting-out parameters of {} hold {range}: used beyond them, as asked",
            gas.name
        ));
    }
    let mixture = crate::engine::recipe::mixture_of(snap, recipe, options, answer)?;
    let solutes: Vec<&Solute> = mixture.solutes.iter().map(|(s, _)| *s).collect();
    let volume = Volume {
        t_k,
        stated: true,
        unit_density: options.assume_unit_density,
        reviewed_only: options.reviewed_only,
    };
    // Where some solute's density coefficients do not reach the temperature, the density at
    // the nearest temperature they all reach, however far: a solution's density moves by
    // tenths of a percent over tens of kelvin, which moves the estimate far less than its
    // uncertainty.
    let density_t_k = coefficient_sets(snap, &solutes, &volume)
        .filter(|_| !options.assume_unit_density)
        .and_then(|sets| nearest_density_temperature(&sets, t_k, f64::INFINITY))
        .unwrap_or(t_k);
    let read_at = Volume {
        t_k: density_t_k,
        ..volume
    };
    let density = density_of(snap, &solutes, &mixture.ws, &read_at).map_err(|why| {
        EvalError::Unanswerable {
            message: format!(
                "the salting out is reckoned from the ions per litre of {title} at {} C, which needs its density, but {why}; or add `assuming density 1.000 kg/L`",
                celsius(t_k)
            ),
            span: recipe.span,
        }
    })?;
    // (hᵢ, cᵢ in mol/L) of every ion of every salt.
    let mut ions: Vec<(f64, f64)> = Vec::new();
    for ((solute, name), w) in mixture.solutes.iter().zip(&mixture.ws) {
        let split = (solute.kind == SoluteKind::Salt)
            .then(|| electrolyte(&solute.formula))
            .flatten();
        let Some(e) = split else {
            return Err(EvalError::Unanswerable {
                message: format!(
                    "{} ({}) is not a salt whose ions the salting-out parameters name: the salting out of a gas by molecules (sugars, urea, alcohols) and by other ions is not modelled, so the gas in {title} cannot be estimated",
                    solute.name, solute.formula
                ),
                span: name.span,
            });
        };
        let formula_units = w * density * 1000.0 / solute.molar_mass;
        for (symbol, count) in [(e.cation, e.cation_count), (e.anion, e.anion_count)] {
            let Some(ion) = snap.salting_ion(symbol) else {
                return Err(EvalError::Unanswerable {
                    message: format!(
                        "the reference holds no salting-out parameter for the ion {symbol} of {}: the gas in {title} cannot be estimated",
                        solute.name
                    ),
                    span: name.span,
                });
            };
            ions.push((ion.h, f64::from(count) * formula_units));
        }
    }
    let ratio = ratio_to_pure_water(parameters, &ions, t_k);
    let total: f64 = ions.iter().map(|(_, c)| c).sum();
    answer.caveat(format!(
        "salted out by the ions of {title} ({} mol/L of ions at {} C): Sechenov's relation log10(c0/c) = Σ (h_ion + h_gas)·c_ion with the parameters of Weisenberger & Schumpe (1996), so the liquid holds {} % of what pure water holds; an estimate, rougher in strong brines",
        shown(total, 3),
        celsius(t_k),
        round_significant(ratio * 100.0, 3)
    ));
    answer.caveat(if options.assume_unit_density {
        "the ions' concentrations per litre assume density 1.000 kg/L, as asked".to_string()
    } else if density_t_k == t_k {
        format!(
            "the ions' concentrations per litre use the recipe's density at {} C, {} kg/L (Laliberté's model)",
            celsius(t_k),
            round_significant(density, 5)
        )
    } else {
        format!(
            "the ions' concentrations per litre use the recipe's density at {} C, {} kg/L (Laliberté's model), the nearest temperature its solutes' density coefficients all reach: a solution's density changes by tenths of a percent over such a span",
            celsius(density_t_k),
            round_significant(density, 5)
        )
    });
    answer.caveat(
        "salting-out parameters typed from memory of the cited tables, not yet checked against them (from-memory)",
    );
    cite_source(snap, SOURCE, answer);
    Ok(InRecipe {
        ratio,
        density,
        water: mixture.water(),
    })
}

/// The gas's Sechenov parameters, or a refusal that says the gas has none.
fn gas_parameters<'s>(
    snap: &'s Snapshot,
    gas: &Solute,
    title: &str,
    span: Span,
) -> Result<&'s Sechenov, EvalError> {
    snap.salting_gas(&gas.id)
        .ok_or_else(|| EvalError::Unanswerable {
            message: format!(
                "the reference holds no salting-out parameters for {}: its amount in {title} cannot be estimated (ask for pure water: a salt solution holds less gas)",
                gas.name
            ),
            span,
        })
}
