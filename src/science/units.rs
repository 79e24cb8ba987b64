//! Units of temperature, composition and pressure: the one vocabulary shared by the seed
//! loader, the query parser and the output. Symbols are written the same way everywhere.

use serde::{Deserialize, Serialize};

/// A temperature unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum TemperatureUnit {
    Celsius,
    Kelvin,
    Fahrenheit,
}

impl TemperatureUnit {
    pub const ALL: [TemperatureUnit; 3] = [Self::Celsius, Self::Kelvin, Self::Fahrenheit];

    /// The symbol used in output and seed files: `C`, `K`, `F`.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::Celsius => "C",
            Self::Kelvin => "K",
            Self::Fahrenheit => "F",
        }
    }

    /// Accepts `C`, `°C`, `degC`, `K`, `F`, `°F`, `degF` (case-sensitive for K vs k is not
    /// needed: all are upper case in practice, but lower case is accepted).
    pub fn from_symbol(s: &str) -> Option<Self> {
        match s {
            "C" | "c" | "°C" | "degC" => Some(Self::Celsius),
            "K" | "k" => Some(Self::Kelvin),
            "F" | "f" | "°F" | "degF" => Some(Self::Fahrenheit),
            _ => None,
        }
    }

    /// Converts a value in this unit to kelvin.
    pub fn to_kelvin(self, value: f64) -> f64 {
        match self {
            Self::Celsius => value + 273.15,
            Self::Kelvin => value,
            Self::Fahrenheit => (value - 32.0) * 5.0 / 9.0 + 273.15,
        }
    }

    /// Converts kelvin to a value in this unit.
    pub fn from_kelvin(self, kelvin: f64) -> f64 {
        match self {
            Self::Celsius => kelvin - 273.15,
            Self::Kelvin => kelvin,
            Self::Fahrenheit => (kelvin - 273.15) * 9.0 / 5.0 + 32.0,
        }
    }
}

/// A unit of composition of a solution (how much solute is in it).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum CompositionUnit {
    /// grams of anhydrous solute per 100 g of water: `g/100g water`.
    GramsPer100gWater,
    /// mass percent of the solution: `%w/w`.
    MassPercent,
    /// mass fraction of the solution: `w`.
    MassFraction,
    /// moles per kilogram of water: `mol/kg`.
    Molality,
    /// millimoles per kilogram of water: `mmol/kg`.
    MillimolesPerKilogram,
    /// micromoles per kilogram of water: `umol/kg`.
    MicromolesPerKilogram,
    /// mole fraction of solute: `x`.
    MoleFraction,
    /// milligrams per kilogram of solution: `mg/kg`.
    MilligramsPerKilogram,
    /// grams per litre of solution (needs a density): `g/L`.
    GramsPerLitre,
    /// moles per litre of solution (needs a density): `mol/L`.
    MolesPerLitre,
    /// milligrams per litre of solution (needs a density): `mg/L`.
    MilligramsPerLitre,
}

impl CompositionUnit {
    pub const ALL: [CompositionUnit; 11] = [
        Self::GramsPer100gWater,
        Self::MassPercent,
        Self::MassFraction,
        Self::Molality,
        Self::MillimolesPerKilogram,
        Self::MicromolesPerKilogram,
        Self::MoleFraction,
        Self::MilligramsPerKilogram,
        Self::GramsPerLitre,
        Self::MolesPerLitre,
        Self::MilligramsPerLitre,
    ];

    /// The symbol written in output, seed files and queries.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::GramsPer100gWater => "g/100g water",
            Self::MassPercent => "%w/w",
            Self::MassFraction => "w",
            Self::Molality => "mol/kg",
            Self::MillimolesPerKilogram => "mmol/kg",
            Self::MicromolesPerKilogram => "umol/kg",
            Self::MoleFraction => "x",
            Self::MilligramsPerKilogram => "mg/kg",
            Self::GramsPerLitre => "g/L",
            Self::MolesPerLitre => "mol/L",
            Self::MilligramsPerLitre => "mg/L",
        }
    }

    /// Parses a symbol as written in seed files and queries. Accepts a few spellings
    /// (`g/100 g water`, `%`, `wt%`, `µmol/kg`, `mol/l`).
    pub fn from_symbol(s: &str) -> Option<Self> {
        let folded: String = s.split_whitespace().collect::<Vec<_>>().join(" ");
        match folded.as_str() {
            "g/100g water" | "g/100 g water" | "g/100g" | "g/100 g" | "g/100g H2O" => {
                Some(Self::GramsPer100gWater)
            }
            "%w/w" | "% w/w" | "wt%" | "%" | "mass%" => Some(Self::MassPercent),
            "w" | "mass fraction" => Some(Self::MassFraction),
            "mol/kg" | "m" => Some(Self::Molality),
            "mmol/kg" => Some(Self::MillimolesPerKilogram),
            "umol/kg" | "µmol/kg" => Some(Self::MicromolesPerKilogram),
            "x" | "mole fraction" => Some(Self::MoleFraction),
            "mg/kg" | "ppm w/w" => Some(Self::MilligramsPerKilogram),
            "g/L" | "g/l" => Some(Self::GramsPerLitre),
            "mol/L" | "mol/l" | "M" => Some(Self::MolesPerLitre),
            "mg/L" | "mg/l" => Some(Self::MilligramsPerLitre),
            _ => None,
        }
    }

    /// True for units defined per volume of solution, which need the solution's density.
    pub fn needs_density(self) -> bool {
        matches!(
            self,
            Self::GramsPerLitre | Self::MolesPerLitre | Self::MilligramsPerLitre
        )
    }
}

/// A unit of pressure.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum PressureUnit {
    Pascal,
    Kilopascal,
    Bar,
    Atmosphere,
    Psi,
    MillimetreMercury,
    Torr,
}

impl PressureUnit {
    pub const ALL: [PressureUnit; 7] = [
        Self::Pascal,
        Self::Kilopascal,
        Self::Bar,
        Self::Atmosphere,
        Self::Psi,
        Self::MillimetreMercury,
        Self::Torr,
    ];

    pub fn symbol(self) -> &'static str {
        match self {
            Self::Pascal => "Pa",
            Self::Kilopascal => "kPa",
            Self::Bar => "bar",
            Self::Atmosphere => "atm",
            Self::Psi => "psi",
            Self::MillimetreMercury => "mmHg",
            Self::Torr => "torr",
        }
    }

    pub fn from_symbol(s: &str) -> Option<Self> {
        match s {
            "Pa" | "pa" => Some(Self::Pascal),
            "kPa" | "kpa" => Some(Self::Kilopascal),
            "bar" => Some(Self::Bar),
            "atm" => Some(Self::Atmosphere),
            "psi" => Some(Self::Psi),
            "mmHg" | "mmhg" => Some(Self::MillimetreMercury),
            "torr" | "Torr" => Some(Self::Torr),
            _ => None,
        }
    }

    /// Pascals in one of this unit. Exact by definition: 1 atm = 101 325 Pa,
    /// 1 bar = 10^5 Pa, 1 torr = 101 325/760 Pa, 1 mmHg = 133.322 387 415 Pa (conventional
    /// millimetre of mercury), 1 psi = 6 894.757 293 168 Pa (NIST SP 811, appendix B.8).
    pub fn pascals(self) -> f64 {
        match self {
            Self::Pascal => 1.0,
            Self::Kilopascal => 1000.0,
            Self::Bar => 1.0e5,
            Self::Atmosphere => 101_325.0,
            Self::Psi => 6_894.757_293_168,
            Self::MillimetreMercury => 133.322_387_415,
            Self::Torr => 101_325.0 / 760.0,
        }
    }
}
