//! Seed loading: parses the TOML files of `seed-data/` (format in `seed-data/README.md`),
//! validates every record, converts reported values to the canonical forms (kelvin, mass
//! fraction of the anhydrous solute) and writes everything in one transaction.
//!
//! Validation stops at the first bad record and names the file, the record and the reason;
//! because parsing finishes before the transaction starts, and the transaction rolls back on
//! drop, nothing partial is ever written.
//!
//! The liquid-range rule for a point of a solubility dataset in water, kept simple on
//! purpose:
//! - below −55 °C (218.15 K) a point is refused outright: no seed solution stays liquid there;
//! - where the solute has `[freezing]` data, a point is refused when it lies more than
//!   [`FREEZING_TOLERANCE_K`] below the eutectic, or below the tabulated freezing point of a
//!   solution of the same composition (the ice line), since such a solution would be frozen;
//! - above 100 °C (373.15 K) a point is refused unless the dataset's `note` mentions
//!   pressure (any word starting `pressur`, e.g. "measured in a pressurised cell"), since
//!   water boils at 100 °C under one atmosphere.
//!
//! The same range (with the same pressure exception in `note`) bounds the temperatures of
//! Henry's-law records; freezing points must lie between −55 °C and 0 °C.

use crate::science::units::CompositionUnit;

mod format;
mod load;
mod validate;

pub use load::{fingerprint, read_seed_dir};
pub(crate) use load::{hex, write};
pub(crate) use validate::{check_slug, first_use, optional, problem, syntax};
pub use validate::{parse_seed, parse_with_known, parse_with_known_sources, to_mass_fraction};

/// Lowest temperature of a liquid point in seed data: −55 °C.
pub const LOWEST_LIQUID_K: f64 = 218.15;
/// Boiling point of water at one atmosphere: 100 °C.
pub const BOILING_K: f64 = 373.15;
/// Melting point of ice: 0 °C.
pub const ICE_K: f64 = 273.15;
/// How far below the ice line or eutectic a point may lie before it is refused. Sources
/// round and disagree by a few tenths of a kelvin; a whole kelvin is a clear fault.
pub const FREEZING_TOLERANCE_K: f64 = 1.0;

/// Composition units accepted in seed datasets (seed-data/README.md).
pub(crate) const SEED_UNITS: [CompositionUnit; 5] = [
    CompositionUnit::GramsPer100gWater,
    CompositionUnit::MassPercent,
    CompositionUnit::MassFraction,
    CompositionUnit::Molality,
    CompositionUnit::MoleFraction,
];

/// Conventions accepted for a `vant-hoff` Henry's-law record (seed-data/README.md).
pub const HENRY_CONVENTIONS: [&str; 5] = [
    "Hcp mol/(m3 Pa)",
    "Hcp mol/(L atm)",
    "KH atm",
    "KH bar",
    "Hcc",
];

/// Why a seed record was refused. Each variant's doc comment shows an input that triggers it.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SeedProblem {
    /// Not valid TOML, or a field missing, misspelt or of the wrong type, e.g.
    /// `kind = "salty"` or a solute file without `formula`.
    #[error("{message}")]
    Syntax { message: String },

    /// The seed has no `sources.toml`.
    #[error("the seed has no sources.toml")]
    MissingSources,

    /// A `.toml` file outside the layout, e.g. `notes/extra.toml`.
    #[error(
        "not a seed file: expected sources.toml, densities.toml, solutes/<id>.toml, checks/<name>.toml or thermochemistry/<name>.toml"
    )]
    UnexpectedFile,

    /// A dataset names a source that `sources.toml` lacks, e.g. `source = "crc-98"`.
    #[error("unknown source key \"{key}\" (not in sources.toml)")]
    UnknownSource { key: String },

    /// A unit satline does not know, e.g. `unit = "furlongs"` or `temperature_unit = "R"`.
    #[error("unknown unit \"{unit}\"; expected one of {expected}")]
    UnknownUnit { unit: String, expected: String },

    /// A per-volume unit in a dataset, e.g. `unit = "g/L"`: it needs a density.
    #[error(
        "unit \"{unit}\" is per volume of solution and needs a density; seed datasets use g/100g water, %w/w, w, mol/kg or x"
    )]
    VolumeUnit { unit: String },

    /// The same id twice, e.g. two `[[dataset]]` tables with `key = "crc-97"` in one file,
    /// two sources with one key, or a synonym that another solute uses as its name.
    #[error("duplicate {what} \"{id}\"")]
    Duplicate { what: String, id: String },

    /// A formula that does not parse, e.g. `formula = "KN(O3"`.
    #[error("malformed formula \"{formula}\": {reason}")]
    MalformedFormula { formula: String, reason: String },

    /// A temperature where the solution cannot be liquid, e.g. the point `[120, 40.0]` in °C
    /// with no note of pressure, or `[-60, 10.0]`.
    #[error("temperature {temperature} {unit} is outside the liquid range: {reason}")]
    TemperatureOutOfRange {
        temperature: f64,
        unit: String,
        reason: String,
    },

    /// A value that is not a number, e.g. `points = [[20, "high"]]`.
    #[error("{what} is not a number: found {found}")]
    NotNumeric { what: String, found: String },

    /// A point of the wrong shape, e.g. `points = [[20]]` or `points = [20, 31.6]`.
    #[error("expected {expected}; found {found}")]
    MalformedPoint { expected: String, found: String },

    /// A solute whose `id` differs from its file name, e.g. `id = "saltpetre"` in
    /// `solutes/potassium-nitrate.toml`.
    #[error("id \"{id}\" does not match the file name (expected \"{expected}\")")]
    IdMismatch { id: String, expected: String },

    /// Points out of order, e.g. `points = [[20, 31.6], [10, 20.9]]`.
    #[error("{what} must ascend: {current} follows {previous}")]
    NotAscending {
        what: String,
        previous: f64,
        current: f64,
    },

    /// A key or id that is not a slug, e.g. `id = "Potassium Nitrate"`.
    #[error("\"{id}\" is not a valid key: use lower-case letters, digits and '-'")]
    BadKey { id: String },

    /// A number that cannot be what it claims, e.g. a value of `-3.0`, `120` in `%w/w`, a
    /// Henry's-law record on a salt, or a salt without `ions`.
    #[error("{reason}")]
    BadValue { reason: String },
}

/// What a seed load wrote.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SeedSummary {
    pub sources: usize,
    pub solutes: usize,
    pub datasets: usize,
    pub points: usize,
    pub gas_constants: usize,
    pub freezing: usize,
    /// [`fingerprint`] of the seed files.
    pub fingerprint: String,
}

#[cfg(test)]
mod tests {
    use super::validate::*;
    use super::*;
    use crate::science::formula::water_molar_mass;
    use crate::store::{Contents, StoreError};

    use crate::store::demo::SOURCES;

    // Invented demo data for unit tests: not reference values.

    fn solute(points: &str) -> String {
        format!(
            r#"
id = "demo-salt"
name = "demo salt"
formula = "KCl"
kind = "salt"
ions = 2
[[dataset]]
key = "d"
source = "demo"
phase = "KCl"
phase_name = "anhydrous"
unit = "g/100g water"
temperature_unit = "C"
provenance = "derived"
review = "unreviewed"
points = {points}
"#
        )
    }

    /// The demo sources and `text` as the demo salt's file.
    fn solute_file(text: &str) -> Result<Contents, StoreError> {
        parse_seed(&[("sources.toml", SOURCES), ("solutes/demo-salt.toml", text)])
    }

    fn parse(points: &str) -> Result<Contents, StoreError> {
        solute_file(&solute(points))
    }

    #[test]
    fn conversions_follow_the_unit_definitions() {
        let m = 100.0;
        assert_eq!(
            to_mass_fraction(CompositionUnit::GramsPer100gWater, 25.0, m),
            Some(0.2)
        );
        assert_eq!(
            to_mass_fraction(CompositionUnit::MassPercent, 20.0, m),
            Some(0.2)
        );
        assert_eq!(
            to_mass_fraction(CompositionUnit::MassFraction, 0.2, m),
            Some(0.2)
        );
        // 2.5 mol/kg of M = 100 g/mol: 250 g in 1000 g water -> 250/1250.
        assert_eq!(
            to_mass_fraction(CompositionUnit::Molality, 2.5, m),
            Some(0.2)
        );
        // x = 0.5 with M = M_w: equal masses.
        let w = to_mass_fraction(CompositionUnit::MoleFraction, 0.5, water_molar_mass()).unwrap();
        assert!((w - 0.5).abs() < 1e-12);
        assert_eq!(
            to_mass_fraction(CompositionUnit::GramsPerLitre, 1.0, m),
            None
        );
    }

    #[test]
    fn a_good_file_parses() {
        let c = parse("[[0, 10.0], [20, 25]]").unwrap();
        assert_eq!(c.datasets[0].points[1].mass_fraction, 0.2);
        assert_eq!(c.datasets[0].points[1].temperature_k, 293.15);
    }

    #[test]
    fn a_point_above_boiling_needs_a_note_of_pressure() {
        let err = parse("[[20, 10.0], [120, 25]]").unwrap_err();
        assert!(err.to_string().contains("point 2"), "{err}");
        assert!(err.to_string().contains("water boils"), "{err}");
    }

    #[test]
    fn a_point_of_the_wrong_shape_is_refused() {
        let err = parse("[[20]]").unwrap_err();
        assert!(
            err.to_string().contains("expected [temperature, value]"),
            "{err}"
        );
    }

    fn reason(result: Result<Contents, StoreError>) -> String {
        result.unwrap_err().to_string()
    }

    #[test]
    fn solute_files_need_a_sources_file() {
        let text = solute("[[0, 1.0]]");
        let message = reason(parse_seed(&[("solutes/demo-salt.toml", text.as_str())]));
        assert_eq!(
            message,
            "seed file sources.toml, whole file: the seed has no sources.toml"
        );
        // No files at all is an empty reference.
        assert_eq!(parse_seed::<&str, &str>(&[]).unwrap(), Contents::default());
    }

    #[test]
    fn a_file_outside_the_layout_is_refused() {
        let message = reason(parse_seed(&[
            ("sources.toml", SOURCES),
            ("notes/extra.toml", ""),
        ]));
        assert!(message.starts_with("seed file notes/extra.toml, whole file: not a seed file"));
    }

    #[test]
    fn a_key_that_is_not_a_slug_is_refused() {
        let text = solute("[[0, 1.0]]").replace("key = \"d\"", "key = \"Crc 97\"");
        let message = reason(solute_file(&text));
        assert!(
            message.contains("dataset \"Crc 97\": \"Crc 97\" is not a valid key"),
            "{message}"
        );
    }

    #[test]
    fn impossible_values_are_refused() {
        let message = reason(parse("[[0, -3.0]]"));
        assert!(
            message.contains("point 1: -3 g/100g water is not a possible composition"),
            "{message}"
        );
        let text = solute("[[0, 120]]").replace("g/100g water", "%w/w");
        let message = reason(solute_file(&text));
        assert!(
            message.contains("120 %w/w is not a possible composition"),
            "{message}"
        );
        let text = solute("[[0, 1.0]]").replace("ions = 2\n", "");
        let message = reason(solute_file(&text));
        assert!(message.contains("a salt needs `ions`"), "{message}");
        let text = format!(
            "{}\n[[henry]]\nkey = \"h\"\nsource = \"demo\"\nprovenance = \"derived\"\nreview = \"unreviewed\"\nform = \"vant-hoff\"\nconvention = \"Hcc\"\nvalue = 1.0\nreference_temperature_k = 298.15\ntemperature_term_k = 0\n",
            solute("[[0, 1.0]]")
        );
        let message = reason(solute_file(&text));
        assert!(
            message.contains("henry \"h\": Henry's-law records belong to gases"),
            "{message}"
        );
    }

    #[test]
    fn a_hydrate_formula_for_the_solute_is_refused() {
        let text = solute("[[0, 1.0]]").replace("formula = \"KCl\"", "formula = \"KCl·2H2O\"");
        let message = reason(solute_file(&text));
        assert!(
            message.contains("includes water of crystallisation"),
            "{message}"
        );
    }

    #[test]
    fn ice_line_interpolates_inside_the_table_only() {
        let pts = [(0.0, 273.15), (0.1, 263.15)];
        assert_eq!(ice_line_at(&pts, 0.05), Some(268.15));
        assert_eq!(ice_line_at(&pts, 0.2), None);
    }

    #[test]
    fn fingerprint_ignores_file_order_but_not_contents() {
        let a = fingerprint(&[("a", "1"), ("b", "2")]);
        assert_eq!(a, fingerprint(&[("b", "2"), ("a", "1")]));
        assert_ne!(a, fingerprint(&[("a", "1"), ("b", "3")]));
        assert_eq!(a.len(), 64);
    }
}
