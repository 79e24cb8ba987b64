//! The one error type of the science module: every way a computation can refuse its input.

use super::formula::FormulaError;
use crate::number::display;

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
    #[error("{} {unit} is not a possible composition: {why}", display(*.value))]
    InvalidComposition {
        value: f64,
        unit: &'static str,
        why: &'static str,
    },
    /// A number that must be finite and positive is not: a density of `0` g/mL, a molar mass
    /// of `-1`, a temperature of `-5 K`, a pressure of `NaN`.
    #[error("{what} must be a finite positive number, got {}", display(*.value))]
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
    /// Knots not strictly ascending: a branch's temperatures 293.15 K then 283.15 K, or
    /// twice 293.15 K; freezing data's mass fractions 0.1 then 0.05.
    #[error("{what} must be strictly ascending: {} then {}", display(*.previous), display(*.next))]
    NotAscending {
        what: &'static str,
        previous: f64,
        next: f64,
    },
    /// A tabulated number that is not finite: a branch point `(293.15, NaN)`.
    #[error("{what} must be a finite number, got {}", display(*.value))]
    NotFinite { what: &'static str, value: f64 },
    /// A curve with no branch: `Curve::new(vec![])`.
    #[error("a curve needs at least one branch")]
    NoBranches,
    /// A model asked outside the range its parameters were published for: a Pitzer set
    /// fitted at 298.15 K asked at 263.15 K, or beyond its highest molality.
    #[error("outside the model's published range: {0}")]
    OutsideModel(String),
    /// No source gives the ice line of this composition: beyond the tabulated freezing
    /// points, outside every activity model's range and beyond the dilute limit.
    #[error("the ice line is not known here: {0}")]
    IceLineUnknown(String),
    /// A range whose ends are reversed or not finite: from 308.15 K to 278.15 K.
    #[error("temperature range {} K to {} K is not ascending", display(*.t1_k), display(*.t2_k))]
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
    /// A mixture component not in the dry-air table: `"SF6"` under air.
    #[error("`{0}` is not a component of the dry-air table")]
    UnknownAirComponent(String),
    /// Water vapour alone exceeds the total pressure: humid air at 0.01 bar and 50 °C.
    #[error("water vapour pressure {vapour_pa:.0} Pa exceeds the total pressure {total_pa:.0} Pa")]
    VapourExceedsTotal { vapour_pa: f64, total_pa: f64 },
    /// A freezing question above 0 °C or an ice line with no usable data: `freezing at 5 C`.
    #[error("{0}")]
    Freezing(&'static str),
    /// `extrapolate` asked for a temperature farther than the rules of
    /// [`super::bounds`] allow: data from 273.15 K to 373.15 K evaluated at 5273.15 K.
    #[error("{t_k:.2} K is beyond what extrapolation may reach ({low_k:.2} K to {high_k:.2} K)")]
    BeyondExtrapolation { t_k: f64, low_k: f64, high_k: f64 },
    /// `extrapolate` asked beyond an end of the data where that end is a single point, which
    /// gives no trend to follow: data at 293.15 K only, evaluated at 277.15 K.
    #[error(
        "{t_k:.2} K is beyond the data ({t_min_k:.2} K to {t_max_k:.2} K), whose end at {end_k:.2} K is a single point: no trend to extrapolate"
    )]
    NoTrend {
        t_k: f64,
        end_k: f64,
        t_min_k: f64,
        t_max_k: f64,
    },
    /// An extrapolated composition no solution could have: an end tangent reaching a mass
    /// fraction of 1 (all solute, no water) or below 0.
    #[error("extrapolated to {t_k:.2} K the mass fraction would be {w:.4}, which {why}")]
    ImpossibleExtrapolation { t_k: f64, w: f64, why: &'static str },
    /// Water is not liquid at this temperature and pressure: 773.15 K at any pressure,
    /// 383.15 K under one atmosphere of air.
    #[error("{t_k:.2} K: {why}")]
    NotLiquid { t_k: f64, why: String },
    /// A partial pressure where the dilute Henry's law is not used: 10,000 bar.
    #[error(
        "a partial pressure of {partial_pa:.0} Pa is beyond the {limit_pa:.0} Pa up to which this reference uses Henry's law (a dilute, low-pressure law)"
    )]
    BeyondHenry { partial_pa: f64, limit_pa: f64 },
}

#[cfg(test)]
mod tests {
    //! Each variant's documented input, as a test.
    use super::*;
    use crate::science::curve::{Branch, Curve};
    use crate::science::fit::{fit_apelblat, fit_vant_hoff};
    use crate::science::freezing::first_solid_on_cooling;
    use crate::science::gas::{HenryConvention, dry_air_fraction, partial_pressure};
    use crate::science::solve::stays_dissolved;
    use crate::science::units::{CompositionUnit as U, Context, to_mass_fraction};

    fn curve() -> Curve {
        Curve::single(Branch::new("A", &[(273.15, 0.1), (373.15, 0.3)]).unwrap())
    }

    #[test]
    fn every_documented_input_triggers_its_variant() {
        let none = Context::default();
        let e: ScienceError = crate::science::formula::molar_mass("Xy2")
            .unwrap_err()
            .into();
        assert!(matches!(e, ScienceError::Formula(_)));
        assert!(matches!(
            to_mass_fraction(250.0, U::GramsPerLitre, &none),
            Err(ScienceError::MissingDensity { .. })
        ));
        assert!(matches!(
            to_mass_fraction(1.5, U::Molality, &none),
            Err(ScienceError::MissingMolarMass { .. })
        ));
        for (v, u) in [
            (-3.0, U::GramsPer100gWater),
            (1.2, U::MassFraction),
            (f64::NAN, U::MassPercent),
        ] {
            assert!(matches!(
                to_mass_fraction(v, u, &none),
                Err(ScienceError::InvalidComposition { .. })
            ));
        }
        let zero_density = Context {
            molar_mass: None,
            density: Some(0.0),
        };
        assert!(matches!(
            to_mass_fraction(250.0, U::GramsPerLitre, &zero_density),
            Err(ScienceError::NotPositive { .. })
        ));
        assert!(matches!(
            curve().evaluate(-5.0, false),
            Err(ScienceError::NotPositive { .. })
        ));
        assert!(matches!(
            curve().evaluate(200.0, false),
            Err(ScienceError::OutOfRange { .. })
        ));
        let gap = Curve::new(vec![
            Branch::new("A·H2O", &[(273.0, 0.1), (298.0, 0.2)]).unwrap(),
            Branch::new("A", &[(310.0, 0.25), (373.0, 0.3)]).unwrap(),
        ])
        .unwrap();
        assert!(matches!(
            gap.evaluate(305.0, false),
            Err(ScienceError::InGap { .. })
        ));
        assert!(matches!(
            Branch::new("A", &[]),
            Err(ScienceError::TooFewPoints { .. })
        ));
        assert!(matches!(
            fit_apelblat(&[(280.0, 0.1), (290.0, 0.2)]),
            Err(ScienceError::TooFewPoints { .. })
        ));
        for pts in [
            [(293.15, 0.1), (283.15, 0.2)],
            [(293.15, 0.1), (293.15, 0.2)],
        ] {
            assert!(matches!(
                Branch::new("A", &pts),
                Err(ScienceError::NotAscending { .. })
            ));
        }
        assert!(matches!(Curve::new(vec![]), Err(ScienceError::NoBranches)));
        assert!(matches!(
            crate::science::curve::Pchip::new(vec![293.15], vec![f64::NAN]),
            Err(ScienceError::NotFinite { .. })
        ));
        assert!(matches!(
            stays_dissolved(&curve(), 0.05, 308.15, 278.15, 0.1),
            Err(ScienceError::BadRange { .. })
        ));
        assert!(matches!(
            stays_dissolved(&curve(), 0.05, 278.15, 308.15, -0.1),
            Err(ScienceError::BadMargin(_))
        ));
        assert!(matches!(
            fit_vant_hoff(&[(300.0, 0.1), (300.0, 0.2)]),
            Err(ScienceError::FitFailed(_))
        ));
        assert!(matches!(
            fit_vant_hoff(&[(300.0, 0.0), (310.0, 0.2)]),
            Err(ScienceError::FitFailed(_))
        ));
        assert!(matches!(
            HenryConvention::parse("H mol/kg/bar"),
            Err(ScienceError::UnknownConvention(_))
        ));
        assert!(matches!(
            dry_air_fraction("SF6"),
            Err(ScienceError::UnknownAirComponent(_))
        ));
        assert!(matches!(
            partial_pressure(0.2, 1000.0, 323.15, true),
            Err(ScienceError::VapourExceedsTotal { .. })
        ));
        assert!(matches!(
            first_solid_on_cooling(
                &crate::science::freezing::System {
                    curve: None,
                    molar_mass: 58.44,
                    ions: 2,
                    data: None,
                    models: &[],
                },
                0.1,
                278.15
            ),
            Err(ScienceError::Freezing(_))
        ));
        assert!(matches!(
            curve().evaluate(5273.15, true),
            Err(ScienceError::BeyondExtrapolation { .. })
        ));
        let steep = Curve::single(Branch::new("A", &[(273.15, 0.1), (283.15, 0.9)]).unwrap());
        assert!(matches!(
            steep.evaluate(290.0, true),
            Err(ScienceError::ImpossibleExtrapolation { .. })
        ));
        assert!(matches!(
            crate::science::bounds::check_liquid_water(773.15, None),
            Err(ScienceError::NotLiquid { .. })
        ));
        assert!(matches!(
            crate::science::bounds::check_henry_pressure(1.0e10),
            Err(ScienceError::BeyondHenry { .. })
        ));
        // Messages name what was wrong.
        let msg = to_mass_fraction(250.0, U::GramsPerLitre, &none)
            .unwrap_err()
            .to_string();
        assert!(msg.contains("g/L") && msg.contains("density"), "{msg}");
    }
}
