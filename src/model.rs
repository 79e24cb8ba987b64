//! The reference data as plain records: what the store keeps and the catalog is built from.
//!
//! These types carry no behaviour beyond small helpers; the store owns how they are written
//! and read, the science module owns what is computed from them.

use serde::{Deserialize, Serialize};

/// A word of the enum ↔ text tables was not one of its words (a stored or typed value).
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{what} \"{found}\"")]
pub struct UnknownWord {
    /// What the word should name, e.g. `provenance`.
    pub what: &'static str,
    pub found: String,
}

/// A fieldless enum defined with the text of each variant beside it, written once:
/// `as_str`, `from_name`, the list of `NAMES`, `FromStr`, `Display` and serde's
/// `Serialize`/`Deserialize` all come from the one table (the words are those of the seed
/// format, the database, CSV and JSON). The enum derives `Debug`, `Clone`, `Copy`,
/// `PartialEq`, `Eq` and `Hash`; attributes written before `pub enum` are added to those.
/// An unknown word read through serde is refused as serde refuses an unknown variant
/// ("unknown variant `x`, expected one of ...").
macro_rules! words {
    (
        $(#[$meta:meta])*
        pub enum $name:ident as $what:literal {
            $($(#[$variant_meta:meta])* $variant:ident = $text:literal),+ $(,)?
        }
    ) => {
        $(#[$meta])*
        #[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
        pub enum $name {
            $($(#[$variant_meta])* $variant,)+
        }

        impl $name {
            /// Every word, in the order of the variants.
            pub const NAMES: &'static [&'static str] = &[$($text),+];

            /// The word of this variant.
            pub fn as_str(self) -> &'static str {
                match self {
                    $($name::$variant => $text,)+
                }
            }

            /// The variant a word names.
            pub fn from_name(word: &str) -> Option<Self> {
                match word {
                    $($text => Some($name::$variant),)+
                    _ => None,
                }
            }
        }

        impl std::str::FromStr for $name {
            type Err = $crate::model::UnknownWord;

            fn from_str(word: &str) -> Result<Self, Self::Err> {
                $name::from_name(word).ok_or_else(|| $crate::model::UnknownWord {
                    what: $what,
                    found: word.to_string(),
                })
            }
        }

        impl std::fmt::Display for $name {
            fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
                f.write_str(self.as_str())
            }
        }

        impl ::serde::Serialize for $name {
            fn serialize<S: ::serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                s.serialize_str(self.as_str())
            }
        }

        impl<'de> ::serde::Deserialize<'de> for $name {
            fn deserialize<D: ::serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                struct Word;
                impl ::serde::de::Visitor<'_> for Word {
                    type Value = $name;

                    fn expecting(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
                        write!(f, "a {}: one of {}", $what, $name::NAMES.join(", "))
                    }

                    fn visit_str<E: ::serde::de::Error>(self, word: &str) -> Result<$name, E> {
                        $name::from_name(word)
                            .ok_or_else(|| E::unknown_variant(word, $name::NAMES))
                    }
                }
                d.deserialize_str(Word)
            }
        }
    };
}

words! {
    /// What kind of publication a source is.
    pub enum SourceKind as "source kind" {
        Handbook = "handbook",
        Compilation = "compilation",
        Paper = "paper",
        Standard = "standard",
        Book = "book",
        Other = "other",
    }
}

/// `Source` and `SourceFields`, the change that edits one, from one list of fields: a field
/// every source has is a plain value in the record and an `Option` in the change; an
/// optional field is an `Option` in both. In the change `None` leaves a field as it is.
macro_rules! source_and_fields {
    (
        needed { $($(#[$needed_meta:meta])* $needed:ident: $needed_type:ty,)+ }
        optional { $($(#[$optional_meta:meta])* $optional:ident: $optional_type:ty,)+ }
    ) => {
        /// A bibliographic record. Every dataset and every gas constant names one.
        #[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
        pub struct Source {
            /// Stable key used by datasets, e.g. `crc-97-aqsol`.
            pub key: String,
            $($(#[$needed_meta])* pub $needed: $needed_type,)+
            $($(#[$optional_meta])* pub $optional: Option<$optional_type>,)+
        }

        /// Fields to set on a source; `None` leaves a field as it is. Texts are trimmed, and
        /// an empty text clears an optional field.
        #[derive(Debug, Clone, Default, PartialEq)]
        pub struct SourceFields {
            $($(#[$needed_meta])* pub $needed: Option<$needed_type>,)+
            $($(#[$optional_meta])* pub $optional: Option<$optional_type>,)+
        }

        impl Source {
            /// A source with the fields every source has, and none of the optional ones.
            pub fn new(key: String, $($needed: $needed_type),+) -> Source {
                Source {
                    key,
                    $($needed,)+
                    $($optional: None,)+
                }
            }
        }

        impl SourceFields {
            /// Sets the given fields of `source`.
            pub fn apply(&self, source: &mut Source) {
                $(
                    if let Some(value) = &self.$needed {
                        source.$needed = value.tidied();
                    }
                )+
                $(
                    if let Some(value) = &self.$optional {
                        source.$optional = Some(value.tidied()).filter(|v| !v.is_blank());
                    }
                )+
            }
        }
    };
}

/// How [`SourceFields::apply`] sets a value: a text is trimmed, and an empty one clears an
/// optional field.
trait FieldValue: Clone {
    fn tidied(&self) -> Self {
        self.clone()
    }

    fn is_blank(&self) -> bool {
        false
    }
}

impl FieldValue for String {
    fn tidied(&self) -> Self {
        self.trim().to_string()
    }

    fn is_blank(&self) -> bool {
        self.is_empty()
    }
}

impl FieldValue for i32 {}

impl FieldValue for SourceKind {}

// The bibliographic record `Source` and `SourceFields`, the change that edits one.
source_and_fields! {
    needed {
        kind: SourceKind,
        title: String,
        authors: String,
    }
    optional {
        publisher: String,
        edition: String,
        year: i32,
        /// Table, page or section the numbers come from.
        locator: String,
        doi: String,
        isbn: String,
        url: String,
        note: String,
    }
}

words! {
    /// Salt, molecular solute or gas.
    pub enum SoluteKind as "solute kind" {
        Salt = "salt",
        Molecular = "molecular",
        Gas = "gas",
    }
}

words! {
    /// How a dataset came to be.
    pub enum Provenance as "provenance" {
        /// Measured by the authors of the source.
        Measured = "measured",
        /// Taken from an evaluated compilation or handbook table.
        Compiled = "compiled",
        /// Typed from memory of a printed table; must be checked against the table.
        FromMemory = "from-memory",
        /// Computed from other data (for example converted from another unit).
        Derived = "derived",
    }
}

words! {
    /// Review state of a dataset.
    pub enum Review as "review" {
        Unreviewed = "unreviewed",
        Reviewed = "reviewed",
        Rejected = "rejected",
    }
}

/// A substance that dissolves in water.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Solute {
    /// Stable slug, e.g. `potassium-nitrate`.
    pub id: String,
    pub name: String,
    /// Formula of the anhydrous solute, e.g. `KNO3`.
    pub formula: String,
    pub kind: SoluteKind,
    /// Molar mass of the anhydrous solute in g/mol, computed from the formula.
    pub molar_mass: f64,
    pub synonyms: Vec<String>,
    pub tags: Vec<String>,
    /// Cation name for salts, e.g. `potassium`.
    pub cation: Option<String>,
    /// Anion name for salts, e.g. `nitrate`.
    pub anion: Option<String>,
    /// Ions per formula unit when fully dissociated (van 't Hoff factor, ideal); 1 for
    /// molecular solutes.
    pub ions: u32,
    /// Short hazard note (oxidiser, toxic, pressurised gas); shown with answers.
    pub hazard: Option<String>,
}

#[cfg(test)]
impl Solute {
    /// A salt for tests: `formula`, named by it, with an id of it in lower case.
    pub(crate) fn salt_for_tests(formula: &str, molar_mass: f64, ions: u32) -> Solute {
        Solute {
            id: formula.to_lowercase(),
            name: formula.into(),
            formula: formula.into(),
            kind: SoluteKind::Salt,
            molar_mass,
            synonyms: vec![],
            tags: vec![],
            cation: None,
            anion: None,
            ions,
            hazard: None,
        }
    }
}

/// The solid in equilibrium with the saturated solution.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Phase {
    /// Formula of the solid, e.g. `Na2SO4·10H2O`.
    pub formula: String,
    /// Plain name, e.g. `decahydrate`.
    pub name: String,
    /// Molecules of water of crystallisation per formula unit of solute.
    pub water: f64,
}

/// One tabulated point of a dataset.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Point {
    /// Temperature as reported, in the dataset's temperature unit.
    pub temperature_reported: f64,
    /// Canonical temperature in kelvin.
    pub temperature_k: f64,
    /// Value as reported, in the dataset's unit.
    pub value_reported: f64,
    /// Canonical composition: mass fraction of the anhydrous solute in the solution.
    pub mass_fraction: f64,
    /// Optional uncertainty, in the reported unit.
    pub uncertainty: Option<f64>,
}

/// Points from one source for one solid phase of one solute in one solvent.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Dataset {
    /// Stable key, unique across the reference, e.g. `potassium-nitrate/crc-97`.
    pub key: String,
    pub solute: String,
    /// Always `water` for now.
    pub solvent: String,
    pub phase: Phase,
    pub source: String,
    /// Unit of the reported values, as written in output (`g/100g water`, `%w/w`, ...).
    pub unit: String,
    /// Unit of the reported temperatures: `C`, `K` or `F`.
    pub temperature_unit: String,
    pub provenance: Provenance,
    pub review: Review,
    /// Retired datasets are kept but hidden from queries.
    pub retired: bool,
    pub note: Option<String>,
    pub points: Vec<Point>,
    /// Temperatures over which this dataset's solid is the stable phase, where the source
    /// or the seed says so: (low, high) in the dataset's temperature unit, as written.
    /// Without it the branch covers its first to last point.
    pub stable_range: Option<(f64, f64)>,
    /// The same range in kelvin.
    pub stable_range_k: Option<(f64, f64)>,
}

/// How a Henry's-law record expresses the gas's solubility and its temperature dependence.
/// In JSON (and the seed format) the `form` field names it: `vant-hoff`, or a fit's
/// quantity (`mole-fraction-fit`, `molality-fit`) beside the fit's terms.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(into = "LawForm", from = "LawForm")]
pub enum GasLaw {
    /// A constant at a reference temperature with its van 't Hoff temperature dependence.
    VantHoff(VantHoffLaw),
    /// A fitted solubility over a range of temperatures.
    Fit(GasFit),
}

impl GasLaw {
    /// The fit, for a fitted record.
    pub fn fit(&self) -> Option<&GasFit> {
        match self {
            GasLaw::Fit(fit) => Some(fit),
            GasLaw::VantHoff(_) => None,
        }
    }
}

/// A Henry's-law constant at a reference temperature, in the named convention, with the
/// van 't Hoff temperature dependence `d ln H / d(1/T)` in kelvin (for the Hcp convention;
/// the science module converts).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct VantHoffLaw {
    /// Convention and unit of `value`, e.g. `Hcp mol/(m3 Pa)`.
    pub convention: String,
    pub value: f64,
    pub reference_temperature_k: f64,
    /// `d ln Hcp / d(1/T)`, K. Positive for gases whose solubility falls as T rises.
    pub temperature_term_k: f64,
}

words! {
    /// What a gas-solubility fit gives.
    #[derive(Default)]
    pub enum FitQuantity as "gas-law form" {
        /// Mole fraction of dissolved gas (seed form `mole-fraction-fit`).
        #[default]
        MoleFraction = "mole-fraction-fit",
        /// Moles of gas per kg of solution (seed form `molality-fit`, for published fits that
        /// are not mole-fraction fits).
        Molality = "molality-fit",
    }
}

/// A fitted gas solubility `q` at a gas partial pressure of `reference_pressure_pa`:
/// `ln q = a + b/τ + c ln τ + d τ` with `τ = T / scale_k`, fitted from `t_min_k` to
/// `t_max_k`; `quantity` says what `q` is.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct GasFit {
    /// Named by the law's `form` in JSON.
    #[serde(skip)]
    pub quantity: FitQuantity,
    pub a: f64,
    pub b: f64,
    pub c: f64,
    pub d: f64,
    pub scale_k: f64,
    pub reference_pressure_pa: f64,
    pub t_min_k: f64,
    pub t_max_k: f64,
}

/// [`GasLaw`] as JSON writes it: the `form` tag names a fit's quantity.
#[derive(Serialize, Deserialize)]
#[serde(tag = "form", rename_all = "kebab-case")]
enum LawForm {
    VantHoff(VantHoffLaw),
    MoleFractionFit(GasFit),
    MolalityFit(GasFit),
}

impl From<GasLaw> for LawForm {
    fn from(law: GasLaw) -> LawForm {
        match law {
            GasLaw::VantHoff(law) => LawForm::VantHoff(law),
            GasLaw::Fit(fit) => match fit.quantity {
                FitQuantity::MoleFraction => LawForm::MoleFractionFit(fit),
                FitQuantity::Molality => LawForm::MolalityFit(fit),
            },
        }
    }
}

impl From<LawForm> for GasLaw {
    fn from(form: LawForm) -> GasLaw {
        match form {
            LawForm::VantHoff(law) => GasLaw::VantHoff(law),
            LawForm::MoleFractionFit(fit) => GasLaw::Fit(GasFit {
                quantity: FitQuantity::MoleFraction,
                ..fit
            }),
            LawForm::MolalityFit(fit) => GasLaw::Fit(GasFit {
                quantity: FitQuantity::Molality,
                ..fit
            }),
        }
    }
}

/// A Henry's-law record of a gas, with its source.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct GasConstant {
    pub key: String,
    pub solute: String,
    pub source: String,
    pub law: GasLaw,
    pub provenance: Provenance,
    pub review: Review,
    pub note: Option<String>,
}

/// Tabulated freezing points (the ice line) of a solute's solutions, and its eutectic.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FreezingData {
    pub key: String,
    pub solute: String,
    pub source: String,
    /// (mass fraction of anhydrous solute, freezing temperature in K), ascending in mass fraction.
    pub points: Vec<(f64, f64)>,
    /// Eutectic: (mass fraction, temperature in K) where the source gives it.
    pub eutectic: Option<(f64, f64)>,
    pub provenance: Provenance,
    pub review: Review,
}

/// One solute's published coefficients for Laliberté's solution-density model, with the
/// range of temperature and mass fraction they were fitted over (`seed-data/densities.toml`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct DensityCoefficients {
    /// The solute's id; one set per solute.
    pub solute: String,
    pub source: String,
    /// c0…c4 as published.
    pub c: [f64; 5],
    /// Fitted temperature range, °C.
    pub t_min_c: f64,
    pub t_max_c: f64,
    /// Largest mass fraction of the solute in the fitted data.
    pub w_max: f64,
    /// The solute's name in the published table, and its CAS number there.
    pub table_name: Option<String>,
    pub cas: Option<String>,
    /// Number of data points behind the fit, as published.
    pub points: Option<u32>,
    pub provenance: Provenance,
    pub review: Review,
    pub note: Option<String>,
}

words! {
    /// The kind of record a corroboration check is about.
    pub enum CheckSubject as "check subject kind" {
        /// A solubility dataset (`solute/key`).
        Dataset = "dataset",
        /// Tabulated freezing points (`solute/key`).
        Freezing = "freezing",
        /// A Henry's-law record (`solute/key`).
        Henry = "henry",
    }
}

words! {
    /// What a corroboration check found.
    pub enum Verdict as "check verdict" {
        /// The record agrees with the outside reference within the tolerance.
        Pass = "pass",
        /// It does not; the check's explanation should say why the record stays.
        Fail = "fail",
        /// The comparison is not meaningful here (the explanation says why), so it neither
        /// corroborates nor contradicts.
        NotApplicable = "not-applicable",
    }
}

/// A corroboration check: one stored record compared with something outside it (a
/// general-purpose library's model or table, another source, another branch of the same
/// solute). A check never changes the record's review state.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Check {
    /// `<subject>/<local key>`, e.g. `potassium-nitrate/crc-97/heat-sign`.
    pub key: String,
    /// The solute the subject belongs to.
    pub solute: String,
    pub subject_kind: CheckSubject,
    /// Full key of the checked record, e.g. `potassium-nitrate/crc-97`.
    pub subject: String,
    /// What was compared: `heat-sign`, `continuity`, `second-source`, `ice-line`,
    /// `water-activity`, `density-range`, ... (a slug).
    pub kind: String,
    /// The outside reference, in words, with its edition or version.
    pub reference: String,
    /// Another stored record the subject was compared with (continuity, second source).
    pub other: Option<String>,
    /// How the comparison was made.
    pub method: String,
    /// Temperature of the comparison, K, where there is one.
    pub temperature_k: Option<f64>,
    /// The reference's figure.
    pub figure: Option<f64>,
    /// satline's figure, as computed when the check was run.
    pub satline_figure: Option<f64>,
    /// Unit of both figures.
    pub unit: Option<String>,
    pub tolerance: Option<f64>,
    /// Unit of the tolerance: `%` (relative), the figures' unit (absolute), or words.
    pub tolerance_unit: Option<String>,
    pub verdict: Verdict,
    /// Why a check fails (and the record stays) or does not apply.
    pub explanation: Option<String>,
    /// What ran the check, with versions, e.g. `make_fixtures.py, chemicals 1.5.2`.
    pub tool: Option<String>,
}
pub mod thermo;
