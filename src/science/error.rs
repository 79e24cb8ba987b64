//! The one error type of the science module: every way a computation can refuse its input.

use super::formula::FormulaError;

/// Why a science computation could not give a value.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ScienceError {
    /// A formula could not be read: `molar_mass("Xy2")`.
    #[error("formula: {0}")]
    Formula(#[from] FormulaError),
    /// A per-volume unit needs the solution's density: converting `250 g/L` with
    /// `Context::default()`.
    #[error("converting {unit} needs the solution density (g/mL)")]
    MissingDensity { unit: &'static str },
    /// A molar unit needs the solute's molar mass: converting `1.5 mol/kg` with
    /// `Context::default()`.
    #[error("converting {unit} needs the solute's molar mass (g/mol)")]
    MissingMolarMass { unit: &'static str },
    /// A composition that cannot be: `-3 g/100g water`, `1.2 w`, `NaN %w/w`.
    #[error("{value} {unit} is not a possible composition: {why}")]
    InvalidComposition {
        value: f64,
        unit: &'static str,
        why: &'static str,
    },
    /// A number that must be finite and positive is not: a density of `0` g/mL, a molar mass
    /// of `-1`, a temperature of `-5 K`, a pressure of `NaN`.
    #[error("{what} must be a finite positive number, got {value}")]
    NotPositive { what: &'static str, value: f64 },
    /// A temperature outside the data, extrapolation not asked for: a curve with data from
    /// 273.15 K to 373.15 K evaluated at 200 K.
    #[error(
        "{t_k:.2} K is outside the data ({t_min_k:.2} K to {t_max_k:.2} K); extrapolation not requested"
    )]
    OutOfRange {
        t_k: f64,
        t_min_k: f64,
        t_max_k: f64,
    },
    /// A temperature between two branches that have no data there: branches 273–298 K and
    /// 310–373 K evaluated at 305 K without extrapolation.
    #[error("{t_k:.2} K falls between branches with no data ({below_k:.2} K to {above_k:.2} K)")]
    InGap {
        t_k: f64,
        below_k: f64,
        above_k: f64,
    },
    /// A branch or fit built from too few points: a branch with no points, an Apelblat fit of
    /// two points.
    #[error("{what} needs at least {needed} points, got {found}")]
    TooFewPoints {
        what: &'static str,
        needed: usize,
        found: usize,
    },
    /// Temperatures of a branch not strictly ascending: points at 293.15 K then 283.15 K, or
    /// twice 293.15 K.
    #[error("temperatures must be strictly ascending: {previous_k} K then {next_k} K")]
    NotAscending { previous_k: f64, next_k: f64 },
    /// A curve with no branch: `Curve::new(vec![])`.
    #[error("a curve needs at least one branch")]
    NoBranches,
    /// A range whose ends are reversed or not finite: from 308.15 K to 278.15 K.
    #[error("temperature range {t1_k} K to {t2_k} K is not ascending")]
    BadRange { t1_k: f64, t2_k: f64 },
    /// A margin below zero or not finite: `margin -10%`.
    #[error("margin must be zero or positive, got {0}")]
    BadMargin(f64),
    /// Least squares could not be solved: a fit of points that all have the same
    /// temperature, or a van 't Hoff fit of a value ≤ 0 (its logarithm).
    #[error("fit failed: {0}")]
    FitFailed(&'static str),
    /// A Henry's-law convention that is not known: `"H mol/kg/bar"`.
    #[error("unknown Henry's-law convention `{0}`")]
    UnknownConvention(String),
    /// A mixture component not in the dry-air table: `"Xe"` under air.
    #[error("`{0}` is not a component of the dry-air table")]
    UnknownAirComponent(String),
    /// Water vapour alone exceeds the total pressure: humid air at 0.01 bar and 50 °C.
    #[error("water vapour pressure {vapour_pa:.0} Pa exceeds the total pressure {total_pa:.0} Pa")]
    VapourExceedsTotal { vapour_pa: f64, total_pa: f64 },
    /// A freezing question above 0 °C or an ice line with no usable data: `freezing at 5 C`.
    #[error("{0}")]
    Freezing(&'static str),
}
