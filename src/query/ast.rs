//! The typed syntax tree of satline's query language: one `Statement` variant per statement,
//! quantities whose unit decides their type, and byte spans into the script text on every node.
//!
//! Names bound by `let` never appear here: the parser replaces each use by the typed value it
//! stands for, so the engine only ever sees numbers with units.

use std::ops::Range;

use serde::Serialize;

use crate::science::units::{CompositionUnit, PressureUnit, TemperatureUnit};

/// A byte range `start..end` into the text that was parsed (the whole script, not the line).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize)]
pub struct Span {
    pub start: usize,
    pub end: usize,
}

impl Span {
    pub fn new(start: usize, end: usize) -> Self {
        Span { start, end }
    }

    pub fn range(self) -> Range<usize> {
        self.start..self.end
    }

    /// The smallest span covering both.
    pub fn to(self, other: Span) -> Span {
        Span::new(self.start.min(other.start), self.end.max(other.end))
    }

    /// The text under the span, or `""` when the span does not fit `source`.
    pub fn text(self, source: &str) -> &str {
        source.get(self.range()).unwrap_or("")
    }
}

/// A node with the span of the text it came from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Located<T> {
    pub node: T,
    pub span: Span,
}

/// A name as written: a solute (formula, slug or words), a mixture, a filter value.
/// Runs of blanks inside a multi-word name are folded to one space.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Name {
    pub text: String,
    pub span: Span,
}

/// A temperature as written (`5 C`, `278.15 K`, `41 F`).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Temperature {
    pub value: f64,
    pub unit: TemperatureUnit,
    pub span: Span,
}

impl Temperature {
    pub fn kelvin(&self) -> f64 {
        self.unit.to_kelvin(self.value)
    }

    pub fn celsius(&self) -> f64 {
        TemperatureUnit::Celsius.from_kelvin(self.kelvin())
    }
}

/// `from 2 C to 8 C`: `low` is never above `high` (the parser checks).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct TemperatureRange {
    pub low: Temperature,
    pub high: Temperature,
    pub span: Span,
}

/// Where a statement asks about temperature: one temperature or a range.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Temperatures {
    At(Temperature),
    Range(TemperatureRange),
}

impl Temperatures {
    pub fn span(&self) -> Span {
        match self {
            Temperatures::At(t) => t.span,
            Temperatures::Range(r) => r.span,
        }
    }
}

/// How much solute is in the solution (`30 g/100g water`, `12 %w/w`, `1.5 mol/kg`). Never
/// negative.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Loading {
    pub value: f64,
    pub unit: CompositionUnit,
    pub span: Span,
}

/// A pressure (`2.5 bar`, `760 mmHg`). Never negative.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Pressure {
    pub value: f64,
    pub unit: PressureUnit,
    pub span: Span,
}

impl Pressure {
    pub fn pascals(&self) -> f64 {
        self.value * self.unit.pascals()
    }
}

/// A safety margin, `margin 10%`: `percent` is in `0 <= percent < 100`.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Margin {
    pub percent: f64,
    pub span: Span,
}

/// A unit asked for with `in <unit>` or `to <unit>`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct UnitChoice<U> {
    pub unit: U,
    pub span: Span,
}

/// The gas side of `dissolved`: `under 0.21 bar` (the gas's own partial pressure),
/// `under air`, `under air at 2 bar` or `under 2 bar of air` (a named mixture at a total
/// pressure; no total means the engine's standard one).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum GasPressure {
    Partial(Pressure),
    Mixture {
        mixture: Name,
        total: Option<Pressure>,
    },
}

/// Which solutes a screening or a list covers.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum SoluteClass {
    /// `solutes`: every solute.
    Solutes,
    Salts,
    Gases,
    /// `molecular solutes`.
    MolecularSolutes,
}

/// A `with ...` filter; several are joined with `and` and must all hold.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum Filter {
    Cation(Name),
    Anion(Name),
    Tag(Name),
    Element(Name),
    /// A source key, e.g. `source crc-97`.
    Source(Name),
}

/// Flags any statement that reads data may carry.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
pub struct Options {
    /// `extrapolate`: answer outside the data's range (the answer says so).
    pub extrapolate: bool,
    /// `reviewed only`: use only reviewed data.
    pub reviewed_only: bool,
    /// `assuming density 1.000 kg/L`: per-litre amounts use that density instead of the
    /// solution's (the answer says so).
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    pub assume_unit_density: bool,
}

/// A value `let` can bind.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Value {
    Temperature(Temperature),
    Range(TemperatureRange),
    Loading(Loading),
    Pressure(Pressure),
}

impl Value {
    pub fn kind(&self) -> ValueKind {
        match self {
            Value::Temperature(_) => ValueKind::Temperature,
            Value::Range(_) => ValueKind::TemperatureRange,
            Value::Loading(_) => ValueKind::Loading,
            Value::Pressure(_) => ValueKind::Pressure,
        }
    }

    /// The same value, every span pointing at `span` (where a name was used rather than
    /// bound): in a REPL the text of the `let` may be long gone.
    pub(crate) fn at(self, span: Span) -> Value {
        match self {
            Value::Temperature(t) => Value::Temperature(Temperature { span, ..t }),
            Value::Range(r) => Value::Range(TemperatureRange {
                low: Temperature { span, ..r.low },
                high: Temperature { span, ..r.high },
                span,
            }),
            Value::Loading(l) => Value::Loading(Loading { span, ..l }),
            Value::Pressure(p) => Value::Pressure(Pressure { span, ..p }),
        }
    }
}

/// What kind of quantity a place in a statement wants, or a unit or name turned out to be.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum ValueKind {
    Temperature,
    TemperatureRange,
    Loading,
    Pressure,
    Margin,
}

impl ValueKind {
    /// "a temperature", for messages.
    pub fn noun(self) -> &'static str {
        match self {
            ValueKind::Temperature => "a temperature",
            ValueKind::TemperatureRange => "a temperature range",
            ValueKind::Loading => "a loading",
            ValueKind::Pressure => "a pressure",
            ValueKind::Margin => "a margin",
        }
    }

    /// "a temperature such as `5 C`", for "expected ..." messages.
    pub fn example(self) -> &'static str {
        match self {
            ValueKind::Temperature => "a temperature such as `5 C`",
            ValueKind::TemperatureRange => "a temperature range such as `from 2 C to 8 C`",
            ValueKind::Loading => "a loading such as `30 g/100g water`",
            ValueKind::Pressure => "a pressure such as `2.5 bar`",
            ValueKind::Margin => "a margin such as `10%`",
        }
    }

    /// "a temperature unit (`C`, `K`, `F`)", for unit messages.
    pub fn unit_example(self) -> &'static str {
        match self {
            ValueKind::Temperature | ValueKind::TemperatureRange => {
                "a temperature unit (`C`, `K`, `F`)"
            }
            ValueKind::Loading => "a composition unit such as `g/100g water` or `mol/kg`",
            ValueKind::Pressure => "a pressure unit such as `bar` or `atm`",
            ValueKind::Margin => "`%`",
        }
    }
}

/// `solubility of KNO3 at 20 C [in mol/kg]`, or a table over a range:
/// `solubility of KNO3 from 0 C to 40 C [every 5 C]`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Solubility {
    pub solute: Name,
    pub temperatures: Temperatures,
    /// `every 5 C`: the step of a table over a range (none: a round step giving about ten
    /// rows).
    pub every: Option<TemperatureStep>,
    pub unit: Option<UnitChoice<CompositionUnit>>,
    pub options: Options,
}

/// A step of temperature, `every 5 C` (a difference: 5 C and 5 K are the same step, 9 F is
/// 5 K). Above zero.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct TemperatureStep {
    pub kelvin: f64,
    pub span: Span,
}

/// `which salts [with anion sulfate] stay dissolved at 30 g/100g water from 2 C to 8 C
/// [margin 10%]`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Screen {
    pub class: SoluteClass,
    pub filters: Vec<Filter>,
    pub loading: Loading,
    pub temperatures: Temperatures,
    pub margin: Option<Margin>,
    pub options: Options,
}

/// `saturation of KNO3 at 40 g/100g water [in F]`: the temperature(s) where the loading is
/// saturated.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Saturation {
    pub solute: Name,
    pub loading: Loading,
    pub unit: Option<UnitChoice<TemperatureUnit>>,
    pub options: Options,
}

/// `ceiling of KCl from 2 C to 8 C [margin 10%] [in mol/kg]`: the largest safe loading.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Ceiling {
    pub solute: Name,
    pub temperatures: Temperatures,
    pub margin: Option<Margin>,
    pub unit: Option<UnitChoice<CompositionUnit>>,
    pub options: Options,
}

/// `heat of solution of KNO3 at 25 C`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HeatOfSolution {
    pub solute: Name,
    /// The temperature asked, or 25 C (the tables' standard temperature) when none was given
    /// (`stated` false; its span is then the solute's).
    pub temperature: Temperature,
    pub stated: bool,
    pub options: Options,
}

/// A unit of mass for the amounts of a batch (`g`, `kg`, `mg`, `lb`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum MassUnit {
    Milligram,
    Gram,
    Kilogram,
    /// The avoirdupois pound, 453.59237 g exactly.
    Pound,
}

impl MassUnit {
    pub const ALL: [MassUnit; 4] = [
        MassUnit::Milligram,
        MassUnit::Gram,
        MassUnit::Kilogram,
        MassUnit::Pound,
    ];

    pub fn symbol(self) -> &'static str {
        match self {
            MassUnit::Milligram => "mg",
            MassUnit::Gram => "g",
            MassUnit::Kilogram => "kg",
            MassUnit::Pound => "lb",
        }
    }

    pub fn grams(self) -> f64 {
        match self {
            MassUnit::Milligram => 1e-3,
            MassUnit::Gram => 1.0,
            MassUnit::Kilogram => 1e3,
            MassUnit::Pound => 453.592_37,
        }
    }

    pub fn from_symbol(symbol: &str) -> Option<Self> {
        MassUnit::ALL.into_iter().find(|u| u.symbol() == symbol)
    }
}

/// A mass as written (`300 g`, `1 kg`); always above zero (the parser checks).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Mass {
    pub value: f64,
    pub unit: MassUnit,
    pub span: Span,
}

impl Mass {
    pub fn grams(&self) -> f64 {
        self.value * self.unit.grams()
    }
}

/// The water of a batch as written: a mass (`1 kg`), or a volume (`1 L`, `500 mL`) that the
/// engine turns into a mass with pure water's density at the start temperature.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum WaterAmount {
    Mass(Mass),
    /// Litres of water (`500 mL` is 0.5), above zero.
    Litres {
        value: f64,
        span: Span,
    },
}

impl WaterAmount {
    pub fn span(&self) -> Span {
        match self {
            WaterAmount::Mass(m) => m.span,
            WaterAmount::Litres { span, .. } => *span,
        }
    }
}

/// `dissolving 300 g CaCl2 in 1 kg water from 20 C`: how warm or cold the batch gets
/// while the solid dissolves, with no heat exchanged.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Dissolving {
    pub solid: Mass,
    pub solute: Name,
    pub water: WaterAmount,
    pub start: Temperature,
    pub options: Options,
}

/// `dissolved O2 at 25 C [under air] [in mg/L] [in RECIPE]`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DissolvedGas {
    pub gas: Name,
    pub temperature: Temperature,
    /// `None`: no `under` clause; the engine's default applies.
    pub pressure: Option<GasPressure>,
    pub unit: Option<UnitChoice<CompositionUnit>>,
    /// The liquid, `in recipe ...` or `in NAME`; `None`: pure water.
    pub liquid: Option<super::recipe::Recipe>,
    pub options: Options,
}

/// `freezing of NaCl at 10 g/100g water [at -10 C] [in F]`: without a temperature, the
/// freezing point of the loading; with one, whether ice or salt comes out first.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Freezing {
    pub solute: Name,
    pub loading: Loading,
    pub temperature: Option<Temperature>,
    pub unit: Option<UnitChoice<TemperatureUnit>>,
    pub options: Options,
}

/// `convert 30 g/100g water of Na2SO4 [as Na2SO4·10H2O] to mol/kg [as ...] [at 20 C]`.
/// `as` after the solute says the given loading counts the hydrate's mass; `as` after the
/// unit asks for the answer on that basis. `at` gives a temperature for density.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Convert {
    pub loading: Loading,
    pub solute: Name,
    pub from_basis: Option<Name>,
    pub to: UnitChoice<CompositionUnit>,
    pub to_basis: Option<Name>,
    pub temperature: Option<Temperature>,
    pub options: Options,
}

/// `describe NaCl`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Describe {
    pub solute: Name,
    pub options: Options,
}

/// `sources of NaCl`, or `sources` for every source.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Sources {
    pub solute: Option<Name>,
    pub options: Options,
}

/// `list salts [with anion sulfate]`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct List {
    pub class: SoluteClass,
    pub filters: Vec<Filter>,
    pub options: Options,
}

/// `let cold = from 2 C to 8 C`. Already applied to the parser's environment; the engine
/// only acknowledges it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Let {
    pub name: Name,
    pub value: Value,
}

/// `require KCl stays dissolved at 20 g/100g water over cold [margin 10%]`: holds or not.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Require {
    pub solute: Name,
    pub loading: Loading,
    pub temperatures: Temperatures,
    pub margin: Option<Margin>,
    pub options: Options,
}

/// The loading of a screening question drawn on a plot: `with loading 30 g/100g water
/// [from 2 C to 8 C]`; without temperatures the storage range is the plot's whole range.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PlotLoading {
    pub loading: Loading,
    pub temperatures: Option<Temperatures>,
    /// From `with` to the end of the clause.
    pub span: Span,
}

/// `plot KNO3, KCl [from 0 C to 100 C] [in mol/kg] [with loading 30 g/100g water from 2 C
/// to 8 C] [margin 10%] [under air]`: a picture of curves.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Plot {
    /// One or more solutes, as written, in order.
    pub solutes: Vec<Name>,
    /// `None`: the range of the data.
    pub range: Option<TemperatureRange>,
    pub unit: Option<UnitChoice<CompositionUnit>>,
    pub loading: Option<PlotLoading>,
    /// Only with a loading (the parser checks).
    pub margin: Option<Margin>,
    /// Gases only: the pressure the dissolved amount is drawn at.
    pub pressure: Option<GasPressure>,
    /// `with ice`: the whole phase diagram, the ice line and the eutectic too (its span).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub ice: Option<Span>,
    pub options: Options,
}

/// One statement of the language.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum Statement {
    Solubility(Solubility),
    Screen(Screen),
    Saturation(Saturation),
    Ceiling(Ceiling),
    HeatOfSolution(HeatOfSolution),
    Dissolving(Dissolving),
    DissolvedGas(DissolvedGas),
    Freezing(Freezing),
    Convert(Convert),
    Describe(Describe),
    Sources(Sources),
    List(List),
    Let(Let),
    Require(Require),
    Plot(Plot),
    /// A statement about a recipe (`let eyewash = recipe ...`, `require eyewash stays ...`).
    Recipe(super::recipe::RecipeStatement),
}

impl Statement {
    /// The statement's kind as a short word (`lookup`, `screening`, ...), for answers.
    pub fn kind(&self) -> &'static str {
        match self {
            Statement::Solubility(_) => "lookup",
            Statement::Screen(_) => "screening",
            Statement::Saturation(_) => "saturation",
            Statement::Ceiling(_) => "ceiling",
            Statement::HeatOfSolution(_) => "heat-of-solution",
            Statement::Dissolving(_) => "dissolving",
            Statement::DissolvedGas(_) => "dissolved-gas",
            Statement::Freezing(_) => "freezing",
            Statement::Convert(_) => "convert",
            Statement::Describe(_) => "describe",
            Statement::Sources(_) => "sources",
            Statement::List(_) => "list",
            Statement::Let(_) => "let",
            Statement::Require(_) => "require",
            Statement::Plot(_) => "plot",
            Statement::Recipe(r) => r.kind(),
        }
    }
}
