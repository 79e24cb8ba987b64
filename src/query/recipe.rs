//! Recipes in the syntax tree: a list of solutes with amounts (each amount a typed loading in
//! any unit, per-litre included), the temperature their volumes are meant at, and the
//! questions a recipe can be asked.

use serde::Serialize;

use super::ast::{
    Loading, Margin, Name, Options, Span, Temperature, TemperatureStep, Temperatures, UnitChoice,
};
use crate::science::units::TemperatureUnit;

/// One line of a recipe: `0.9 %w/v NaCl`. The amount is a loading (never a temperature: the
/// parser refuses one).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Ingredient {
    pub amount: Loading,
    pub solute: Name,
    /// From the amount to the end of the solute's name (or of its `at pH …`).
    pub span: Span,
    /// `10 mM sodium phosphate at pH 7.4`: the solute is a buffer named by its acid and
    /// counter-ion, set to this pH; the engine turns it into the buffer's forms.
    pub ph: Option<SetPh>,
}

/// The pH a buffer of a recipe is set to, and where it was written.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SetPh {
    pub value: f64,
    pub span: Span,
}

/// `recipe 0.9 %w/v NaCl, 10 mM KH2PO4 [volume at 25 C]`: solutes with amounts, in the order
/// written. Per-litre amounts are per litre of the finished solution at `volume_at` (20 °C
/// when not given, and the answer says so).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Recipe {
    /// The name it was bound to with `let` (or in a recipe file); `None` when written in
    /// the statement itself.
    pub name: Option<Name>,
    pub ingredients: Vec<Ingredient>,
    pub volume_at: Option<Temperature>,
    pub span: Span,
}

impl Recipe {
    /// The same recipe with every span pointing at `span` (where its name was used): the
    /// text it was written in may be another line of a session, or a recipe file.
    pub(crate) fn at(&self, span: Span) -> Recipe {
        Recipe {
            name: self.name.as_ref().map(|n| Name {
                text: n.text.clone(),
                span,
            }),
            ingredients: self
                .ingredients
                .iter()
                .map(|i| Ingredient {
                    amount: Loading { span, ..i.amount },
                    solute: Name {
                        text: i.solute.text.clone(),
                        span,
                    },
                    span,
                    ph: i.ph.map(|p| SetPh { span, ..p }),
                })
                .collect(),
            volume_at: self.volume_at.map(|t| Temperature { span, ..t }),
            span,
        }
    }

    /// The recipe's name, or `the recipe` when it was written in the statement.
    pub fn title(&self) -> String {
        match &self.name {
            Some(n) => format!("recipe {}", n.text),
            None => "the recipe".to_string(),
        }
    }
}

/// What a statement asks of a recipe.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum RecipeQuestion {
    /// `let eyewash = recipe ...`: binds the name; the answer lists the ingredients.
    Define,
    /// `require eyewash stays dissolved from 2 C to 8 C [margin 10%]`.
    Require {
        temperatures: Temperatures,
        margin: Option<Margin>,
    },
    /// `which solids form in eyewash from -5 C to 25 C`.
    SolidsForm { temperatures: Temperatures },
    /// `saturation of eyewash [in F]`: each solute's saturation temperatures.
    Saturation {
        unit: Option<UnitChoice<TemperatureUnit>>,
    },
    /// `describe eyewash [at 25 C]`: the composition in every basis, per litre at the
    /// temperature given (else the recipe's volume temperature).
    Describe { at: Option<Temperature> },
    /// `freezing of eyewash at -20 C`: the ice and salts out of the recipe at that
    /// temperature, and the liquid left; without a temperature, where the recipe as made
    /// starts to freeze.
    Freezing { at: Option<Temperature> },
    /// `ph of eyewash from 2 C to 25 C [every 1 C]`: the pH at each temperature, the amounts
    /// fixed (without `every`, at each end and every multiple of 5 °C between).
    Ph {
        temperatures: Temperatures,
        every: Option<TemperatureStep>,
    },
}

/// A statement about a recipe, named or written in place.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RecipeStatement {
    pub recipe: Recipe,
    pub question: RecipeQuestion,
    pub options: Options,
}

impl RecipeStatement {
    /// The statement's kind as a short word, for answers.
    pub fn kind(&self) -> &'static str {
        match self.question {
            RecipeQuestion::Define => "let",
            RecipeQuestion::Require { .. } => "require",
            RecipeQuestion::SolidsForm { .. } => "solids",
            RecipeQuestion::Saturation { .. } => "saturation",
            RecipeQuestion::Describe { .. } => "describe",
            RecipeQuestion::Freezing { .. } => "freezing",
            RecipeQuestion::Ph { .. } => "ph",
        }
    }
}
