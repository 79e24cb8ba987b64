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
            // `º` (the ordinal indicator) is often typed for `°`; `℃` and `℉` are the
            // single characters of the two scales.
            "C" | "c" | "°C" | "° C" | "ºC" | "º C" | "℃" | "degC" | "deg C" | "degrees C" => {
                Some(Self::Celsius)
            }
            "K" | "k" => Some(Self::Kelvin),
            "F" | "f" | "°F" | "° F" | "ºF" | "º F" | "℉" | "degF" | "deg F" | "degrees F" => {
                Some(Self::Fahrenheit)
            }
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
    /// milligrams per millilitre of solution (needs a density): `mg/mL`, equal to g/L.
    MilligramsPerMillilitre,
    /// millimoles per litre of solution (needs a density): `mmol/L`, written `mM` too.
    MillimolesPerLitre,
    /// micromoles per litre of solution (needs a density): `umol/L`, written `uM` too.
    MicromolesPerLitre,
    /// grams per 100 mL of solution (needs a density): `%w/v`.
    PercentWeightPerVolume,
}

impl CompositionUnit {
    pub const ALL: [CompositionUnit; 15] = [
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
        Self::MilligramsPerMillilitre,
        Self::MillimolesPerLitre,
        Self::MicromolesPerLitre,
        Self::PercentWeightPerVolume,
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
            Self::MilligramsPerMillilitre => "mg/mL",
            Self::MillimolesPerLitre => "mmol/L",
            Self::MicromolesPerLitre => "umol/L",
            Self::PercentWeightPerVolume => "%w/v",
        }
    }

    /// Parses a symbol as written in seed files and queries. Accepts a few spellings
    /// (`g/100 g water`, `wt%`, `µmol/kg`, `mol/l`, `mM`, `uM`). A bare `%` is no unit: it
    /// does not say whether it is per mass or per volume of solution (`%w/w` or `%w/v`); a
    /// bare `ppm` likewise (`ppm w/w`). See [`ambiguous_symbol`].
    pub fn from_symbol(s: &str) -> Option<Self> {
        let folded: String = s.split_whitespace().collect::<Vec<_>>().join(" ");
        match folded.as_str() {
            "g/100g water" | "g/100 g water" | "g/100g" | "g/100 g" | "g/100g H2O" => {
                Some(Self::GramsPer100gWater)
            }
            "%w/w" | "% w/w" | "wt%" | "w/w%" | "mass%" => Some(Self::MassPercent),
            "w" | "mass fraction" => Some(Self::MassFraction),
            "mol/kg" | "m" => Some(Self::Molality),
            "mmol/kg" => Some(Self::MillimolesPerKilogram),
            "umol/kg" | "µmol/kg" => Some(Self::MicromolesPerKilogram),
            "x" | "mole fraction" => Some(Self::MoleFraction),
            "mg/kg" | "ppm w/w" => Some(Self::MilligramsPerKilogram),
            "g/L" | "g/l" => Some(Self::GramsPerLitre),
            "mol/L" | "mol/l" | "M" => Some(Self::MolesPerLitre),
            "mg/L" | "mg/l" => Some(Self::MilligramsPerLitre),
            "mg/mL" | "mg/ml" => Some(Self::MilligramsPerMillilitre),
            "mmol/L" | "mmol/l" | "mM" => Some(Self::MillimolesPerLitre),
            "umol/L" | "umol/l" | "µmol/L" | "µmol/l" | "uM" | "µM" => {
                Some(Self::MicromolesPerLitre)
            }
            "%w/v" | "% w/v" | "w/v%" => Some(Self::PercentWeightPerVolume),
            _ => None,
        }
    }

    /// True for units defined per volume of solution, which need the solution's density.
    pub fn needs_density(self) -> bool {
        matches!(
            self,
            Self::GramsPerLitre
                | Self::MolesPerLitre
                | Self::MilligramsPerLitre
                | Self::MilligramsPerMillilitre
                | Self::MillimolesPerLitre
                | Self::MicromolesPerLitre
                | Self::PercentWeightPerVolume
        )
    }

    /// For a per-volume unit: grams of solute per millilitre of solution in one of this
    /// unit (molar units times the molar mass `molar_mass`, g/mol). `None` for other units.
    /// g/L = mg/mL = 10⁻³ g/mL; mg/L = 10⁻⁶; %w/v = 10⁻² (g per 100 mL); mol/L = M·10⁻³,
    /// mmol/L = M·10⁻⁶, umol/L = M·10⁻⁹.
    pub fn grams_per_millilitre(self, molar_mass: f64) -> Option<f64> {
        match self {
            Self::GramsPerLitre | Self::MilligramsPerMillilitre => Some(1.0e-3),
            Self::MilligramsPerLitre => Some(1.0e-6),
            Self::PercentWeightPerVolume => Some(1.0e-2),
            Self::MolesPerLitre => Some(molar_mass * 1.0e-3),
            Self::MillimolesPerLitre => Some(molar_mass * 1.0e-6),
            Self::MicromolesPerLitre => Some(molar_mass * 1.0e-9),
            _ => None,
        }
    }

    /// True for the molar units, which need the solute's molar mass.
    pub fn is_molar(self) -> bool {
        matches!(
            self,
            Self::Molality
                | Self::MillimolesPerKilogram
                | Self::MicromolesPerKilogram
                | Self::MoleFraction
                | Self::MolesPerLitre
                | Self::MillimolesPerLitre
                | Self::MicromolesPerLitre
        )
    }
}

/// A symbol that looks like a composition unit but does not say its basis, with the words
/// to say instead: `%` (`%w/w` or `%w/v`) and `ppm` (`ppm w/w`).
pub fn ambiguous_symbol(s: &str) -> Option<&'static str> {
    match s.trim() {
        "%" => Some(
            "a bare `%` does not say whether it is per mass or per volume of solution: write `%w/w` (g per 100 g of solution) or `%w/v` (g per 100 mL of solution)",
        ),
        "ppm" | "ppb" => Some(
            "`ppm` does not say its basis: write `ppm w/w` (mg per kg of solution) or a per-litre unit such as `mg/L`",
        ),
        _ => None,
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

// ---------------------------------------------------------------------------------------
// Conversions. Composition goes through the canonical mass fraction `w` of the anhydrous
// solute in the solution; every unit converts to and from `w`.
// ---------------------------------------------------------------------------------------

use super::error::ScienceError;

/// Molar mass of water, g/mol: 2 × 1.008 + 15.999 = 18.015 from the CIAAW 2021 conventional
/// atomic weights (see `formula::ATOMIC_WEIGHTS`).
pub const WATER_MOLAR_MASS: f64 = 18.015;

/// What a composition conversion may need beyond the value and its unit.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Context {
    /// Molar mass of the anhydrous solute, g/mol (needed by mol/kg, mmol/kg, umol/kg, x,
    /// mol/L).
    pub molar_mass: Option<f64>,
    /// Density of the solution, g/mL (needed by g/L, mol/L, mg/L).
    pub density: Option<f64>,
}

impl Context {
    /// A context with only a molar mass, g/mol.
    pub fn with_molar_mass(molar_mass: f64) -> Self {
        Self {
            molar_mass: Some(molar_mass),
            density: None,
        }
    }

    fn molar_mass_for(&self, unit: CompositionUnit) -> Result<f64, ScienceError> {
        let m = self.molar_mass.ok_or(ScienceError::MissingMolarMass {
            unit: unit.symbol(),
        })?;
        positive("molar mass (g/mol)", m)
    }

    /// Grams per millilitre in one of a per-volume `unit` (molar ones need the molar mass).
    fn volume_scale(&self, unit: CompositionUnit) -> Result<f64, ScienceError> {
        let m = if unit.is_molar() {
            self.molar_mass_for(unit)?
        } else {
            1.0
        };
        unit.grams_per_millilitre(m)
            .ok_or(ScienceError::MissingDensity {
                unit: unit.symbol(),
            })
    }

    fn density_for(&self, unit: CompositionUnit) -> Result<f64, ScienceError> {
        let d = self.density.ok_or(ScienceError::MissingDensity {
            unit: unit.symbol(),
        })?;
        positive("density (g/mL)", d)
    }
}

pub(crate) fn positive(what: &'static str, value: f64) -> Result<f64, ScienceError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(ScienceError::NotPositive { what, value })
    }
}

fn invalid(value: f64, unit: CompositionUnit, why: &'static str) -> ScienceError {
    ScienceError::InvalidComposition {
        value,
        unit: unit.symbol(),
        why,
    }
}

/// A loading in grams per 100 g of water, refused when negative or not finite.
fn grams_per_100g_water(grams: f64) -> Result<(), ScienceError> {
    if !grams.is_finite() || grams < 0.0 {
        return Err(invalid(
            grams,
            CompositionUnit::GramsPer100gWater,
            "negative or not finite",
        ));
    }
    Ok(())
}

/// Converts a composition to the mass fraction of anhydrous solute in the solution.
///
/// With r the solute-to-water mass ratio (g solute per g water), M the solute's molar mass,
/// M_w = 18.015 g/mol and ρ the solution density in g/mL (definitions, e.g. IUPAC Green
/// Book, 3rd ed., §2.10):
/// - `g/100g water`: r = v/100, w = r/(1+r); `%w/w`: w = v/100; `w`: w = v;
/// - `mol/kg` (per kg water): r = v·M/1000; `mmol/kg`, `umol/kg` likewise with v/10³, v/10⁶;
/// - `x`: w = xM / (xM + (1−x)M_w);
/// - `mg/kg` (per kg solution): w = v/10⁶;
/// - per volume (`g/L`, `mg/L`, `mg/mL`, `%w/v`, `mol/L`, `mmol/L`, `umol/L`): w = v·s/ρ
///   with s the unit's grams per millilitre ([`CompositionUnit::grams_per_millilitre`]),
///   e.g. `g/L`: w = v/(1000ρ), `mol/L`: w = vM/(1000ρ).
pub fn to_mass_fraction(
    value: f64,
    unit: CompositionUnit,
    ctx: &Context,
) -> Result<f64, ScienceError> {
    use CompositionUnit::*;
    if !value.is_finite() {
        return Err(invalid(value, unit, "not a finite number"));
    }
    if value < 0.0 {
        return Err(invalid(value, unit, "negative"));
    }
    let from_ratio = |r: f64| r / (1.0 + r);
    let w = match unit {
        GramsPer100gWater => from_ratio(value / 100.0),
        MassPercent => value / 100.0,
        MassFraction => value,
        Molality => from_ratio(value * ctx.molar_mass_for(unit)? / 1000.0),
        MillimolesPerKilogram => from_ratio(value * ctx.molar_mass_for(unit)? / 1.0e6),
        MicromolesPerKilogram => from_ratio(value * ctx.molar_mass_for(unit)? / 1.0e9),
        MoleFraction => {
            if value >= 1.0 {
                return Err(invalid(value, unit, "a mole fraction must be below 1"));
            }
            let m = ctx.molar_mass_for(unit)?;
            value * m / (value * m + (1.0 - value) * WATER_MOLAR_MASS)
        }
        MilligramsPerKilogram => value / 1.0e6,
        // The per-volume units.
        _ => value * ctx.volume_scale(unit)? / ctx.density_for(unit)?,
    };
    if w >= 1.0 {
        return Err(invalid(
            value,
            unit,
            "the solute would be all of the solution (mass fraction ≥ 1)",
        ));
    }
    Ok(w)
}

/// Converts a mass fraction of anhydrous solute to a composition unit: the inverse of
/// [`to_mass_fraction`], with the same formulas solved for v. `w` must lie in [0, 1).
pub fn from_mass_fraction(
    w: f64,
    unit: CompositionUnit,
    ctx: &Context,
) -> Result<f64, ScienceError> {
    from_mass_fraction_and_ratio(w, w / (1.0 - w), unit, ctx)
}

/// [`from_mass_fraction`] where the ratio of solute to water `r` = w/(1 − w) is known
/// already (a screening has it from its verdict). Always inlined: in a screening's loop the
/// unit is the same for every solute, and the call cost more than the conversion (100,000
/// invented solutes at one temperature: 5.4 -> 4.8 ms).
#[inline(always)]
pub fn from_mass_fraction_and_ratio(
    w: f64,
    r: f64,
    unit: CompositionUnit,
    ctx: &Context,
) -> Result<f64, ScienceError> {
    use CompositionUnit::*;
    if !w.is_finite() || !(0.0..1.0).contains(&w) {
        return Err(invalid(
            w,
            MassFraction,
            "a mass fraction must lie in [0, 1)",
        ));
    }
    Ok(match unit {
        GramsPer100gWater => 100.0 * r,
        MassPercent => 100.0 * w,
        MassFraction => w,
        Molality => 1000.0 * r / ctx.molar_mass_for(unit)?,
        MillimolesPerKilogram => 1.0e6 * r / ctx.molar_mass_for(unit)?,
        MicromolesPerKilogram => 1.0e9 * r / ctx.molar_mass_for(unit)?,
        MoleFraction => {
            let m = ctx.molar_mass_for(unit)?;
            let n = w / m;
            n / (n + (1.0 - w) / WATER_MOLAR_MASS)
        }
        MilligramsPerKilogram => 1.0e6 * w,
        // The per-volume units.
        _ => ctx.density_for(unit)? * w / ctx.volume_scale(unit)?,
    })
}

/// Converts between any two composition units through the mass fraction.
pub fn convert_composition(
    value: f64,
    from: CompositionUnit,
    to: CompositionUnit,
    ctx: &Context,
) -> Result<f64, ScienceError> {
    from_mass_fraction(to_mass_fraction(value, from, ctx)?, to, ctx)
}

/// Hydrate basis → anhydrous basis.
///
/// `hydrate_per_100g_water` grams of a hydrate (anhydrous molar mass `anhydrous_molar_mass`
/// g/mol, `water` molecules of water of crystallisation) dissolved in 100 g of added water
/// give, per 100 g of total water, 100·h·f / (100 + h·(1−f)) grams of anhydrous salt, where
/// f = M_anh / (M_anh + n·M_w) is the anhydrous share of the hydrate's mass (mass balance).
pub fn hydrate_to_anhydrous(
    hydrate_per_100g_water: f64,
    anhydrous_molar_mass: f64,
    water: f64,
) -> Result<f64, ScienceError> {
    let f = anhydrous_share(anhydrous_molar_mass, water)?;
    let h = hydrate_per_100g_water;
    grams_per_100g_water(h)?;
    Ok(100.0 * h * f / (100.0 + h * (1.0 - f)))
}

/// Anhydrous basis → hydrate basis: the inverse of [`hydrate_to_anhydrous`],
/// h = 100·r / (f − r·(1−f)) with r = anhydrous grams per gram of total water. A loading
/// richer in salt than the hydrate itself (f − r(1−f) ≤ 0) cannot be made from the hydrate
/// and water and is an error.
pub fn anhydrous_to_hydrate(
    anhydrous_per_100g_water: f64,
    anhydrous_molar_mass: f64,
    water: f64,
) -> Result<f64, ScienceError> {
    let f = anhydrous_share(anhydrous_molar_mass, water)?;
    let a = anhydrous_per_100g_water;
    grams_per_100g_water(a)?;
    let r = a / 100.0;
    let denominator = f - r * (1.0 - f);
    if denominator <= 0.0 {
        return Err(invalid(
            a,
            CompositionUnit::GramsPer100gWater,
            "more salt per water than the hydrate itself holds",
        ));
    }
    Ok(100.0 * r / denominator)
}

fn anhydrous_share(anhydrous_molar_mass: f64, water: f64) -> Result<f64, ScienceError> {
    let m = positive("molar mass (g/mol)", anhydrous_molar_mass)?;
    if !water.is_finite() || water < 0.0 {
        return Err(ScienceError::NotPositive {
            what: "water of crystallisation",
            value: water,
        });
    }
    Ok(m / (m + water * WATER_MOLAR_MASS))
}

/// A pressure in `unit` → pascals (factors of [`PressureUnit::pascals`]).
pub fn pressure_to_pa(value: f64, unit: PressureUnit) -> f64 {
    value * unit.pascals()
}

/// Pascals → a pressure in `unit`.
pub fn pressure_from_pa(pa: f64, unit: PressureUnit) -> f64 {
    pa / unit.pascals()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn missing_things_are_named() {
        let none = Context::default();
        assert_eq!(
            to_mass_fraction(250.0, CompositionUnit::GramsPerLitre, &none),
            Err(ScienceError::MissingDensity { unit: "g/L" })
        );
        assert_eq!(
            to_mass_fraction(1.5, CompositionUnit::Molality, &none),
            Err(ScienceError::MissingMolarMass { unit: "mol/kg" })
        );
        assert_eq!(
            from_mass_fraction(0.1, CompositionUnit::MoleFraction, &none),
            Err(ScienceError::MissingMolarMass { unit: "x" })
        );
        assert!(to_mass_fraction(-3.0, CompositionUnit::GramsPer100gWater, &none).is_err());
        assert!(to_mass_fraction(1.2, CompositionUnit::MassFraction, &none).is_err());
    }

    #[test]
    fn worked_values() {
        // By hand: 25 g/100g water is 25/125 = 0.2 mass fraction.
        let c = Context::with_molar_mass(58.44);
        let w = to_mass_fraction(25.0, CompositionUnit::GramsPer100gWater, &c).unwrap();
        assert!((w - 0.2).abs() < 1e-12);
        // 1 mol/kg NaCl: r = 0.05844, w = 0.05844/1.05844.
        let w = to_mass_fraction(1.0, CompositionUnit::Molality, &c).unwrap();
        assert!((w - 0.05844 / 1.05844).abs() < 1e-12);
        // By hand: 1 atm = 760 torr.
        assert!((pressure_from_pa(101_325.0, PressureUnit::Torr) - 760.0).abs() < 1e-9);
    }

    #[test]
    fn hydrate_basis() {
        // Worked by hand: 322.2 g Na2SO4·10H2O (1 mol, 142.04 g salt + 180.15 g water) in
        // 100 g water: 142.04 g salt in 280.15 g water = 50.70 g/100g water.
        let m = 142.04;
        let a = hydrate_to_anhydrous(m + 10.0 * WATER_MOLAR_MASS, m, 10.0).unwrap();
        assert!((a - 100.0 * m / (100.0 + 10.0 * WATER_MOLAR_MASS)).abs() < 1e-9);
        let h = anhydrous_to_hydrate(a, m, 10.0).unwrap();
        assert!((h - (m + 10.0 * WATER_MOLAR_MASS)).abs() < 1e-9);
        // The decahydrate holds 142/180 g salt per g water = 78.8 g/100g; beyond is impossible.
        assert!(anhydrous_to_hydrate(80.0, m, 10.0).is_err());
    }
}
