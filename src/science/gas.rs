//! Dissolved gases: Henry's-law conventions and their conversions, temperature dependence,
//! partial pressures from air (with the water-vapour correction), water's vapour pressure
//! and density, and the dissolved amount in the units of the trade.
//!
//! In the API: temperatures in K, pressures in Pa, molar masses in g/mol, Hcp in
//! mol/(m³·Pa).

use super::curve::Basis;
use super::error::ScienceError;
use super::heat::{GAS_CONSTANT, HeatSign, heat_from_slope};
use super::units::{WATER_MOLAR_MASS, positive};
use crate::model::{FitQuantity, GasFit, GasLaw};

/// One standard atmosphere, Pa (exact by definition).
pub const STANDARD_ATMOSPHERE: f64 = 101_325.0;

/// Temperature of STP as used for Bunsen coefficients and mL(STP)/L, K: 0 °C.
pub const STP_TEMPERATURE: f64 = 273.15;

/// Pressure of STP as used for Bunsen coefficients and mL(STP)/L, Pa: 1 atm. (This is the
/// older convention kept by gas-solubility tables, e.g. R. Sander, Atmos. Chem. Phys. 15
/// (2015) 4399–4981, §2; IUPAC's STP since 1982 is 100 kPa, which is not used here.)
pub const STP_PRESSURE: f64 = 101_325.0;

/// Molar volume of an ideal gas at STP (273.15 K, 101.325 kPa), L/mol: R·T/p = 22.414.
pub fn stp_molar_volume_l() -> f64 {
    GAS_CONSTANT * STP_TEMPERATURE / STP_PRESSURE * 1000.0
}

/// Saturation vapour pressure of pure water, Pa, by the Wagner–Pruss equation:
///
/// ln(p/p_c) = (T_c/T)(a₁τ + a₂τ^1.5 + a₃τ³ + a₄τ^3.5 + a₅τ⁴ + a₆τ^7.5), τ = 1 − T/T_c,
/// T_c = 647.096 K, p_c = 22.064 MPa, a₁…a₆ = −7.85951783, 1.84408259, −11.7866497,
/// 22.6807411, −15.9618719, 1.80122502.
///
/// Source: W. Wagner and A. Pruss, J. Phys. Chem. Ref. Data 22 (1993) 783–787; IAPWS,
/// "Revised Supplementary Release on Saturation Properties of Ordinary Water Substance"
/// (1992), eq. 2.5. Valid from the triple point (273.16 K) to T_c; 273.15 K is accepted
/// (0.01 K below the triple point, where the equation is still smooth).
pub fn water_vapour_pressure(t_k: f64) -> Result<f64, ScienceError> {
    const TC: f64 = 647.096;
    const PC: f64 = 22.064e6;
    const A: [f64; 6] = [
        -7.859_517_83,
        1.844_082_59,
        -11.786_649_7,
        22.680_741_1,
        -15.961_871_9,
        1.801_225_02,
    ];
    if !(t_k.is_finite() && (273.15..=TC).contains(&t_k)) {
        return Err(ScienceError::OutOfRange {
            t_k,
            t_min_k: 273.15,
            t_max_k: TC,
        });
    }
    let tau = 1.0 - t_k / TC;
    let s = A[0] * tau
        + A[1] * tau.powf(1.5)
        + A[2] * tau.powi(3)
        + A[3] * tau.powf(3.5)
        + A[4] * tau.powi(4)
        + A[5] * tau.powf(7.5);
    Ok(PC * (TC / t_k * s).exp())
}

/// Density of pure air-free water at 1 atm, kg/m³, by Kell's equation:
///
/// ρ = (999.83952 + 16.945176 t − 7.9870401e−3 t² − 46.170461e−6 t³ + 105.56302e−9 t⁴
///      − 280.54253e−12 t⁵) / (1 + 16.879850e−3 t), t in °C.
///
/// Source: G. S. Kell, J. Chem. Eng. Data 20 (1975) 97–105, eq. 16 (IPTS-68 temperatures;
/// the difference to ITS-90 is below the accuracy needed here). Valid 0–150 °C; accepted
/// from −20 °C (supercooled) for dilute-solution conversions, with that caveat.
pub fn water_density(t_k: f64) -> Result<f64, ScienceError> {
    if !(t_k.is_finite() && (253.15..=423.15).contains(&t_k)) {
        return Err(ScienceError::OutOfRange {
            t_k,
            t_min_k: 253.15,
            t_max_k: 423.15,
        });
    }
    let t = t_k - 273.15;
    let num = 999.839_52 + 16.945_176 * t - 7.987_040_1e-3 * t * t - 46.170_461e-6 * t.powi(3)
        + 105.563_02e-9 * t.powi(4)
        - 280.542_53e-12 * t.powi(5);
    Ok(num / (1.0 + 16.879_850e-3 * t))
}

/// A convention for expressing a Henry's-law constant. Definitions as in R. Sander,
/// "Compilation of Henry's law constants (version 4.0) for water as solvent", Atmos. Chem.
/// Phys. 15 (2015) 4399–4981, §2 (the conversions below are its eqs. for dilute solutions,
/// with the water density taken at the temperature instead of a fixed 997 kg/m³).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum HenryConvention {
    /// Hcp = c/p, mol/(m³·Pa).
    HcpSi,
    /// Hcp = c/p, mol/(L·atm).
    HcpMolPerLitreAtm,
    /// Hbp = molality/p, mol/(kg·bar).
    HbpMolPerKgBar,
    /// KH = p/x, atm.
    KhAtm,
    /// KH = p/x, bar.
    KhBar,
    /// Hcc = c(aq)/c(gas), dimensionless.
    Hcc,
    /// Bunsen coefficient α: volume of gas at STP (273.15 K, 1 atm) absorbed per volume of
    /// water at a gas partial pressure of 1 atm, dimensionless.
    Bunsen,
}

impl HenryConvention {
    /// The spelling used in seed files and output.
    pub fn symbol(self) -> &'static str {
        match self {
            Self::HcpSi => "Hcp mol/(m3 Pa)",
            Self::HcpMolPerLitreAtm => "Hcp mol/(L atm)",
            Self::HbpMolPerKgBar => "Hbp mol/(kg bar)",
            Self::KhAtm => "KH atm",
            Self::KhBar => "KH bar",
            Self::Hcc => "Hcc",
            Self::Bunsen => "Bunsen",
        }
    }

    /// Parses a convention; spaces, `*`, `·` and case are ignored, `³` reads as `3`.
    pub fn parse(text: &str) -> Result<Self, ScienceError> {
        let key: String = text
            .chars()
            .filter(|c| !c.is_whitespace() && *c != '*' && *c != '·')
            .map(|c| if c == '³' { '3' } else { c })
            .collect::<String>()
            .to_lowercase();
        Ok(match key.as_str() {
            "hcpmol/(m3pa)" | "hcp" => Self::HcpSi,
            "hcpmol/(latm)" | "hcpm/atm" => Self::HcpMolPerLitreAtm,
            "hbpmol/(kgbar)" => Self::HbpMolPerKgBar,
            "khatm" | "kh(p/x)atm" => Self::KhAtm,
            "khbar" | "kh(p/x)bar" => Self::KhBar,
            "hcc" => Self::Hcc,
            "bunsen" | "α" => Self::Bunsen,
            _ => return Err(ScienceError::UnknownConvention(text.to_string())),
        })
    }
}

/// How a Henry's-law constant in one convention relates to Hcp, mol/(m³·Pa), at one
/// temperature: Hcp = value·k (`Times`), or Hcp = k/value (`Over`, the volatility forms).
enum ToHcp {
    Times(f64),
    Over(f64),
}

/// The factor of `convention` at `t_k`: Hcp·(L·atm) ×1000/101325; Hbp ×ρ/10⁵; KH:
/// ρ/(M_w·KH·p_unit) with ρ/M_w the molar concentration of water (ρ from
/// [`water_density`] at t_k); Hcc: Hcc/(R·T); Bunsen: α/(R·T_STP).
fn to_hcp_factor(convention: HenryConvention, t_k: f64) -> Result<ToHcp, ScienceError> {
    let t_k = positive("temperature (K)", t_k)?;
    let water_mol_per_m3 = || water_density(t_k).map(|rho| rho * 1000.0 / WATER_MOLAR_MASS);
    Ok(match convention {
        HenryConvention::HcpSi => ToHcp::Times(1.0),
        HenryConvention::HcpMolPerLitreAtm => ToHcp::Times(1000.0 / STANDARD_ATMOSPHERE),
        HenryConvention::HbpMolPerKgBar => ToHcp::Times(water_density(t_k)? / 1.0e5),
        HenryConvention::KhAtm => ToHcp::Over(water_mol_per_m3()? / STANDARD_ATMOSPHERE),
        HenryConvention::KhBar => ToHcp::Over(water_mol_per_m3()? / 1.0e5),
        HenryConvention::Hcc => ToHcp::Times(1.0 / (GAS_CONSTANT * t_k)),
        HenryConvention::Bunsen => ToHcp::Times(1.0 / (GAS_CONSTANT * STP_TEMPERATURE)),
    })
}

/// Converts a Henry's-law constant in `convention` at `t_k` to Hcp, mol/(m³·Pa) (the
/// factors: [`to_hcp_factor`]).
pub fn to_hcp(value: f64, convention: HenryConvention, t_k: f64) -> Result<f64, ScienceError> {
    let value = positive("Henry's-law constant", value)?;
    Ok(match to_hcp_factor(convention, t_k)? {
        ToHcp::Times(k) => value * k,
        ToHcp::Over(k) => k / value,
    })
}

/// Converts Hcp, mol/(m³·Pa), at `t_k` to `convention`: the inverse of [`to_hcp`].
pub fn from_hcp(hcp: f64, convention: HenryConvention, t_k: f64) -> Result<f64, ScienceError> {
    let hcp = positive("Henry's-law constant", hcp)?;
    Ok(match to_hcp_factor(convention, t_k)? {
        ToHcp::Times(k) => hcp / k,
        ToHcp::Over(k) => k / hcp,
    })
}

/// Hcp at `t_k` from a van 't Hoff record: Hcp(T) = Hcp(T_ref)·exp(B·(1/T − 1/T_ref)),
/// B = d ln Hcp / d(1/T) in K (Sander 2015, eq. 19); the record's value is first converted
/// to Hcp at T_ref with [`to_hcp`].
pub fn vant_hoff_hcp(
    convention: &str,
    value: f64,
    reference_temperature_k: f64,
    temperature_term_k: f64,
    t_k: f64,
) -> Result<f64, ScienceError> {
    let conv = HenryConvention::parse(convention)?;
    let t_ref = positive("reference temperature (K)", reference_temperature_k)?;
    let t_k = positive("temperature (K)", t_k)?;
    let h_ref = to_hcp(value, conv, t_ref)?;
    Ok(h_ref * (temperature_term_k * (1.0 / t_k - 1.0 / t_ref)).exp())
}

/// The fitted quantity at the fit's reference partial pressure: for a mole-fraction fit
/// ln x = a + b/τ + c ln τ + d τ, τ = T/scale_k (the form of the IUPAC Solubility Data
/// Series fits; Clever & Battino), for a molality fit the same in ln m. Returns (value,
/// inside the fit's range); `None` for a van 't Hoff record.
pub fn mole_fraction_fit(law: &GasLaw, t_k: f64) -> Option<(f64, bool)> {
    law.fit().map(|fit| fit.value(t_k))
}

/// Dissolved gas in the units of the trade.
#[derive(Debug, Clone, PartialEq)]
pub struct Dissolved {
    /// mol per m³ of solution (= mmol/L).
    pub mol_per_m3: f64,
    /// mg per litre of solution.
    pub mg_per_l: f64,
    /// mg per kg of solution.
    pub mg_per_kg: f64,
    /// mmol per kg of water.
    pub mmol_per_kg: f64,
    /// µmol per kg of water.
    pub umol_per_kg: f64,
    /// mL of gas at STP (273.15 K, 101.325 kPa, ideal gas) per litre of solution.
    pub ml_stp_per_l: f64,
    /// Mole fraction of the gas in the solution.
    pub mole_fraction: f64,
    /// `Fitted` inside the record's temperature range (or for a van 't Hoff record, which
    /// states none), `Extrapolated` outside a fit's range.
    pub basis: Basis,
}

/// How much gas dissolves in pure water at `t_k` under a partial pressure of the gas.
///
/// Henry's law: the dissolved amount is proportional to the gas's partial pressure
/// (dilute, ideal). For a van 't Hoff record, c = Hcp(T)·p ([`vant_hoff_hcp`]); for a
/// mole-fraction fit, x = x_fit(T)·p/p_ref ([`mole_fraction_fit`]); for a molality fit, as
/// some sources give it (e.g. R. F. Weiss, Marine Chemistry 2 (1974) 203–215, for CO2),
/// n = K(T)·p/p_ref moles of gas per kg of solution. Per-volume and per-mass
/// amounts are related through the pure-water density ([`water_density`], Kell 1975): the
/// solution is taken to be as dense as water (dilute). Molar mass in g/mol.
pub fn dissolved(
    law: &GasLaw,
    molar_mass: f64,
    t_k: f64,
    partial_pressure_pa: f64,
) -> Result<Dissolved, ScienceError> {
    let m = positive("molar mass (g/mol)", molar_mass)?;
    let t_k = positive("temperature (K)", t_k)?;
    if !(partial_pressure_pa.is_finite() && partial_pressure_pa >= 0.0) {
        return Err(ScienceError::NotPositive {
            what: "partial pressure (Pa)",
            value: partial_pressure_pa,
        });
    }
    let rho = water_density(t_k)?; // kg/m³
    // Moles of gas (n) per kg of water, and the basis.
    let (n_per_kg_water, basis) = match law {
        GasLaw::VantHoff(law) => {
            let hcp = vant_hoff_hcp(
                &law.convention,
                law.value,
                law.reference_temperature_k,
                law.temperature_term_k,
                t_k,
            )?;
            let c = hcp * partial_pressure_pa; // mol/m³ of solution
            // Water in 1 m³ of solution of density ρ: ρ − c·M/1000 kg.
            (c / (rho - c * m / 1000.0), Basis::Fitted)
        }
        GasLaw::Fit(fit) => {
            let p_ref = positive("reference pressure (Pa)", fit.reference_pressure_pa)?;
            let (q_ref, inside) = fit.value(t_k);
            let q = q_ref * partial_pressure_pa / p_ref;
            let per_kg = match fit.quantity {
                // x mole fraction: n/(n + 1000/M_w) = x.
                FitQuantity::MoleFraction => q / (1.0 - q) * 1000.0 / WATER_MOLAR_MASS,
                // q mol per kg of solution, whose kg holds q·M/1000 kg of gas. Fugacity is
                // taken equal to partial pressure (for CO2 at 1 atm about 0.5 % apart).
                FitQuantity::Molality => q / (1.0 - q * m / 1000.0),
            };
            let basis = if inside {
                Basis::Fitted
            } else {
                Basis::Extrapolated
            };
            (per_kg, basis)
        }
    };
    Ok(amounts(n_per_kg_water, m, rho, basis))
}

/// All the units of [`Dissolved`] from moles of gas per kg of water, molar mass (g/mol) and
/// solution density ρ (kg/m³, taken as pure water's).
fn amounts(n_per_kg_water: f64, m: f64, rho: f64, basis: Basis) -> Dissolved {
    let gas_kg_per_kg_water = n_per_kg_water * m / 1000.0;
    let n_per_kg_solution = n_per_kg_water / (1.0 + gas_kg_per_kg_water);
    let mol_per_m3 = n_per_kg_solution * rho;
    let water_mol_per_kg = 1000.0 / WATER_MOLAR_MASS;
    Dissolved {
        mol_per_m3,
        mg_per_l: mol_per_m3 * m,
        mg_per_kg: n_per_kg_solution * m * 1000.0,
        mmol_per_kg: n_per_kg_water * 1000.0,
        umol_per_kg: n_per_kg_water * 1.0e6,
        ml_stp_per_l: mol_per_m3 * stp_molar_volume_l(),
        mole_fraction: n_per_kg_water / (n_per_kg_water + water_mol_per_kg),
        basis,
    }
}

impl GasFit {
    /// The fitted quantity at `t_k` (at the reference pressure), and whether `t_k` is
    /// inside the fit's range.
    pub fn value(&self, t_k: f64) -> (f64, bool) {
        let tau = t_k / self.scale_k;
        let q = (self.a + self.b / tau + self.c * tau.ln() + self.d * tau).exp();
        (q, t_k >= self.t_min_k && t_k <= self.t_max_k)
    }

    /// d ln q / d(1/T) at `t_k`, K: b·s − c·T − d·T²/s.
    pub fn slope_k(&self, t_k: f64) -> f64 {
        self.b * self.scale_k - self.c * t_k - self.d * t_k * t_k / self.scale_k
    }
}

/// Apparent enthalpy of solution of a gas at `t_k`, kJ/mol, with its sign word:
/// ΔH = −R · d ln H / d(1/T). For a van 't Hoff record d ln Hcp/d(1/T) is the record's term;
/// for a mole-fraction fit, d ln x/d(1/T) = b·s − c·T − d·T²/s (s = scale_k).
pub fn gas_heat_of_solution(law: &GasLaw, t_k: f64) -> Result<(f64, HeatSign), ScienceError> {
    let t_k = positive("temperature (K)", t_k)?;
    let slope = match law {
        GasLaw::VantHoff(law) => law.temperature_term_k,
        GasLaw::Fit(fit) => fit.slope_k(t_k),
    };
    let dh = heat_from_slope(slope);
    Ok((dh, HeatSign::of(dh)))
}

/// Composition of dry air, mole fractions.
///
/// N2, O2, Ar, Ne, He, Kr, Xe, H2, CH4: U.S. Standard Atmosphere, 1976 (NOAA/NASA/USAF,
/// 1976), Table 3, sea-level composition of dry air. CO2: 419.3 µmol/mol, the global
/// annual mean for 2023 of the NOAA Global Monitoring Laboratory (value from memory; the
/// 1976 table's 314 µmol/mol is long out of date; CO2 rises by about 2.4 µmol/mol a year).
pub const DRY_AIR: &[(&str, f64)] = &[
    ("N2", 0.780_84),
    ("O2", 0.209_476),
    ("Ar", 0.009_34),
    ("CO2", 419.3e-6),
    ("Ne", 18.18e-6),
    ("He", 5.24e-6),
    ("CH4", 2.0e-6),
    ("Kr", 1.14e-6),
    ("H2", 0.5e-6),
    ("Xe", 0.087e-6),
];

/// Mole fraction of a component of dry air, by formula (`O2`, `CO2`, ...).
pub fn dry_air_fraction(formula: &str) -> Result<f64, ScienceError> {
    DRY_AIR
        .iter()
        .find(|(f, _)| *f == formula)
        .map(|&(_, x)| x)
        .ok_or_else(|| ScienceError::UnknownAirComponent(formula.to_string()))
}

/// Partial pressure of a gas of dry-basis mole fraction `dry_fraction` in a gas mixture at
/// `total_pressure_pa`, Pa. With `humid` the mixture is saturated with water vapour at
/// `t_k` (as over water it is in equilibrium with): p = y·(P − p_w(T)), p_w by
/// [`water_vapour_pressure`]; otherwise p = y·P (Dalton's law).
pub fn partial_pressure(
    dry_fraction: f64,
    total_pressure_pa: f64,
    t_k: f64,
    humid: bool,
) -> Result<f64, ScienceError> {
    if !(dry_fraction.is_finite() && (0.0..=1.0).contains(&dry_fraction)) {
        return Err(ScienceError::InvalidComposition {
            value: dry_fraction,
            unit: "x",
            why: "a mole fraction in the gas must lie in [0, 1]",
        });
    }
    let total = positive("total pressure (Pa)", total_pressure_pa)?;
    let dry = if humid {
        let pw = water_vapour_pressure(t_k)?;
        if pw >= total {
            return Err(ScienceError::VapourExceedsTotal {
                vapour_pa: pw,
                total_pa: total,
            });
        }
        total - pw
    } else {
        total
    };
    Ok(dry_fraction * dry)
}

/// Partial pressure of an air component (by formula) over water saturated with air at
/// `total_pressure_pa` and `t_k`, humid: y_air·(P − p_w(T)).
pub fn partial_pressure_in_air(
    formula: &str,
    total_pressure_pa: f64,
    t_k: f64,
) -> Result<f64, ScienceError> {
    partial_pressure(dry_air_fraction(formula)?, total_pressure_pa, t_k, true)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::VantHoffLaw;

    #[test]
    fn vapour_pressure_known_points() {
        // Normal boiling point: 101.325 kPa at 373.124 K (IAPWS-95, ITS-90), from memory.
        let p = water_vapour_pressure(373.124).unwrap();
        assert!((p / 101_325.0 - 1.0).abs() < 1e-3, "{p}");
        assert!(water_vapour_pressure(200.0).is_err());
    }

    #[test]
    fn density_known_points() {
        // 999.97 kg/m³ at 4 °C and 997.05 at 25 °C (CRC Handbook, from memory).
        assert!((water_density(277.15).unwrap() - 999.97).abs() < 0.02);
        assert!((water_density(298.15).unwrap() - 997.05).abs() < 0.02);
    }

    #[test]
    fn conventions_round_trip() {
        for conv in [
            HenryConvention::HcpSi,
            HenryConvention::HcpMolPerLitreAtm,
            HenryConvention::HbpMolPerKgBar,
            HenryConvention::KhAtm,
            HenryConvention::KhBar,
            HenryConvention::Hcc,
            HenryConvention::Bunsen,
        ] {
            assert_eq!(HenryConvention::parse(conv.symbol()).unwrap(), conv);
            let v = from_hcp(1.3e-5, conv, 298.15).unwrap();
            let back = to_hcp(v, conv, 298.15).unwrap();
            assert!((back / 1.3e-5 - 1.0).abs() < 1e-12, "{conv:?}");
        }
        // By hand: 1.3e-5 mol/(m³ Pa) × 101325/1000 = 1.317e-3 mol/(L atm).
        let v = from_hcp(1.3e-5, HenryConvention::HcpMolPerLitreAtm, 298.15).unwrap();
        assert!((v - 1.3e-5 * 101.325).abs() < 1e-12);
        assert!(HenryConvention::parse("H mol/kg/bar").is_err());
    }

    #[test]
    fn vant_hoff_falls_with_temperature_for_positive_term() {
        let law = GasLaw::VantHoff(VantHoffLaw {
            convention: "Hcp mol/(m3 Pa)".into(),
            value: 1.3e-5,
            reference_temperature_k: 298.15,
            temperature_term_k: 1500.0,
        });
        let cold = dissolved(&law, 31.998, 278.15, 21_000.0).unwrap();
        let warm = dissolved(&law, 31.998, 308.15, 21_000.0).unwrap();
        assert!(cold.mg_per_l > warm.mg_per_l);
        let (dh, sign) = gas_heat_of_solution(&law, 298.15).unwrap();
        assert_eq!(sign, HeatSign::Exothermic);
        assert!((dh + GAS_CONSTANT * 1.5).abs() < 1e-9);
        // At T_ref: c = Hcp·p exactly (dilute).
        let at_ref = dissolved(&law, 31.998, 298.15, 21_000.0).unwrap();
        assert!((at_ref.mol_per_m3 / (1.3e-5 * 21_000.0) - 1.0).abs() < 1e-6);
    }

    #[test]
    fn molality_fit_is_henrys_law() {
        // Invented parameters: ln K = −4 at every T (a = −4), so K = e⁻⁴ mol/kg per atm.
        let fit = GasFit {
            quantity: FitQuantity::Molality,
            a: -4.0,
            b: 0.0,
            c: 0.0,
            d: 0.0,
            scale_k: 100.0,
            reference_pressure_pa: 101_325.0,
            t_min_k: 273.15,
            t_max_k: 313.15,
        };
        let law = GasLaw::Fit(fit);
        let d = dissolved(&law, 44.0, 293.15, 50_662.5).unwrap();
        let n = (-4.0f64).exp() * 0.5;
        assert!((d.mg_per_kg - n * 44.0 * 1000.0).abs() < 1e-9);
        assert_eq!(d.basis, Basis::Fitted);
        assert_eq!(
            dissolved(&law, 44.0, 330.0, 1e5).unwrap().basis,
            Basis::Extrapolated
        );
    }

    #[test]
    fn humid_air_partial_pressure() {
        let p = partial_pressure_in_air("O2", 101_325.0, 298.15).unwrap();
        let pw = water_vapour_pressure(298.15).unwrap();
        assert!((p - 0.209_476 * (101_325.0 - pw)).abs() < 1e-9);
        assert!(partial_pressure_in_air("Zz", 101_325.0, 298.15).is_err());
        assert!(matches!(
            partial_pressure(0.2, 1000.0, 323.15, true),
            Err(ScienceError::VapourExceedsTotal { .. })
        ));
        assert!((stp_molar_volume_l() - 22.414).abs() < 1e-3);
    }
}
