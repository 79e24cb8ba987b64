//! The rows of `freezing of RECIPE at T`, one layout whichever model follows the path
//! (Pitzer's equations in [`crate::engine::freeze_recipe`], the solutes' own freezing
//! points in [`crate::engine::mixture_ice`]): amounts as % of the recipe's mass.

use std::collections::BTreeMap;

use serde_json::json;

use crate::answer::{Basis, Row};
use crate::engine::common::{celsius, value};
use crate::number::round_significant;

/// A path's state at one temperature, per kg of the recipe's water at the start.
pub struct PathRows {
    /// The recipe's mass per kg of its water, kg.
    pub recipe_kg: f64,
    /// The temperature asked, K.
    pub t_k: f64,
}

impl PathRows {
    fn percent(&self, kg: f64) -> f64 {
        value(100.0 * kg / self.recipe_kg)
    }

    fn computed(&self, solute: String, quantity: &'static str) -> Row {
        Row {
            solute: Some(solute),
            quantity: Some(quantity.into()),
            basis: Some(Basis::Computed),
            temperature_c: Some(celsius(self.t_k)),
            ..Row::default()
        }
    }

    /// The ice: `ice_kg` per kg of the recipe's water, with where the recipe as made starts
    /// to freeze and where ice appears on the path.
    pub fn ice(&self, ice_kg: f64, ice_line: Option<f64>, ice_from: Option<f64>) -> Row {
        Row {
            value: Some(self.percent(ice_kg)),
            unit: Some("% of the recipe's mass".into()),
            phase: Some("ice".into()),
            extra: BTreeMap::from([
                ("ice_line_c".to_string(), json!(ice_line.map(celsius))),
                ("ice_from_c".to_string(), json!(ice_from.map(celsius))),
                ("water_frozen_pct".to_string(), json!(value(100.0 * ice_kg))),
            ]),
            ..self.computed("ice".into(), "ice")
        }
    }

    /// A solute crystallised: `mol` per kg of the recipe's water, of molar mass `molar_mass`
    /// (g/mol, anhydrous), as `phase`.
    pub fn crystallised(&self, solute: &str, mol: f64, molar_mass: f64, phase: &str) -> Row {
        Row {
            value: Some(self.percent(mol * molar_mass / 1000.0)),
            unit: Some("% of the recipe's mass".into()),
            phase: Some(phase.into()),
            ..self.computed(solute.into(), "crystallised")
        }
    }

    /// A solute whose solid could not be said, with the reason.
    pub fn not_said(solute: &str, reason: &str) -> Row {
        Row {
            solute: Some(solute.into()),
            quantity: Some("crystallised".into()),
            extra: BTreeMap::from([("reason".to_string(), json!(reason))]),
            ..Row::default()
        }
    }

    /// An ion or solute in the liquid, mol/kg of the liquid's water.
    pub fn in_liquid(&self, name: String, molality: f64) -> Row {
        Row {
            value: Some(value(molality)),
            unit: Some("mol/kg".into()),
            ..self.computed(name, "in the liquid")
        }
    }

    /// The liquid left: `liquid_kg` per kg of the recipe's water, with its water activity
    /// where it is known.
    pub fn liquid(&self, title: &str, liquid_kg: f64, water_activity: Option<f64>) -> Row {
        Row {
            value: Some(self.percent(liquid_kg)),
            unit: Some("% of the recipe's mass".into()),
            extra: water_activity
                .map(|a| {
                    BTreeMap::from([("water_activity".to_string(), json!(round_significant(a, 5)))])
                })
                .unwrap_or_default(),
            ..self.computed(title.into(), "liquid")
        }
    }

    /// The first salt to come out on cooling, at `t_first` (K).
    pub fn first(solute: Option<String>, phase: Option<String>, t_first: f64) -> Row {
        Row {
            solute,
            quantity: Some("first salt on cooling".into()),
            phase,
            temperature_c: Some(celsius(t_first)),
            basis: Some(Basis::Computed),
            ..Row::default()
        }
    }
}
