//! Thermochemical records: enthalpies of formation, of hydration, ionisation energies,
//! electron affinities and ionic radii (one [`ThermoValue`] each), and Laliberté's
//! heat-capacity coefficients of aqueous solutions ([`HeatCapacityFit`]).
//!
//! Species are written as the tables write them: a crystal or neutral molecule by the
//! formula satline uses for the solute (`NaCl`, `BaCl2·2H2O`, `CH4N2O`), an ion with its
//! charge after the sign (`Na+`, `Ca+2`, `SO4-2`), an atom by its symbol (`Cl`).

use serde::{Deserialize, Serialize};

use super::{Provenance, Review};

words! {
    /// What a [`ThermoValue`] measures.
    pub enum ThermoQuantity as "quantity" {
        /// Standard enthalpy of formation at 298.15 K, kJ/mol, in a [`ThermoState`].
        Formation = "formation",
        /// Standard molar enthalpy of hydration of a gaseous ion, kJ/mol.
        Hydration = "hydration",
        /// Ionic or thermochemical radius, pm.
        Radius = "radius",
        /// The n-th ionisation energy of a gaseous atom or ion, eV.
        Ionisation = "ionisation",
        /// Electron affinity of a gaseous atom, eV.
        ElectronAffinity = "electron-affinity",
    }
}

impl ThermoQuantity {
    /// The one unit a value of this quantity is written in.
    pub fn unit(self) -> &'static str {
        match self {
            ThermoQuantity::Formation | ThermoQuantity::Hydration => "kJ/mol",
            ThermoQuantity::Radius => "pm",
            ThermoQuantity::Ionisation | ThermoQuantity::ElectronAffinity => "eV",
        }
    }
}

words! {
    /// The state of a substance an enthalpy of formation is for.
    pub enum ThermoState as "state" {
        /// `cr`: crystal.
        Crystal = "cr",
        /// `aq`: in water at the standard state m = 1 mol/kg (ideal).
        Aqueous = "aq",
        /// `g`: ideal gas.
        Gas = "g",
        /// `l`: liquid.
        Liquid = "l",
    }
}

/// One tabulated thermochemical figure.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ThermoValue {
    /// The seed file it came from, without `thermochemistry/` and `.toml` (kept so an
    /// export writes it back where it was).
    pub file: String,
    pub quantity: ThermoQuantity,
    /// For [`ThermoQuantity::Formation`] only.
    pub state: Option<ThermoState>,
    /// For [`ThermoQuantity::Ionisation`] only: 1 for the first ionisation energy, ...
    pub stage: Option<u8>,
    pub species: String,
    /// In [`ThermoQuantity::unit`].
    pub value: f64,
    pub source: String,
    pub provenance: Provenance,
    pub review: Review,
    pub note: Option<String>,
}

/// Laliberté's heat-capacity coefficients of one solute in water (J. Chem. Eng. Data 54
/// (2009) 1725): Cp,i = a1·exp(α) + a5·(1 − w_w)^a6, α = a2·t + a3·exp(0.01·t) + a4·(1 − w_w),
/// t in °C, Cp,i in J/(g·K).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct HeatCapacityFit {
    pub file: String,
    /// The solute's anhydrous formula, as satline writes it.
    pub solute: String,
    pub a: [f64; 6],
    pub t_min_c: f64,
    pub t_max_c: f64,
    /// Largest mass fraction of solute in the fit's data.
    pub w_max: f64,
    pub source: String,
    pub provenance: Provenance,
    pub review: Review,
    pub note: Option<String>,
}

/// Every thermochemical record of the reference.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Thermochemistry {
    pub values: Vec<ThermoValue>,
    pub heat_capacity: Vec<HeatCapacityFit>,
}

impl Thermochemistry {
    /// True when there are no records at all.
    pub fn is_empty(&self) -> bool {
        self.values.is_empty() && self.heat_capacity.is_empty()
    }

    /// Every value of `quantity` (and `state`, when given) for `species`, in stored order;
    /// rejected records are left out.
    pub fn find(
        &self,
        quantity: ThermoQuantity,
        state: Option<ThermoState>,
        species: &str,
    ) -> Vec<&ThermoValue> {
        self.values
            .iter()
            .filter(|v| {
                v.quantity == quantity
                    && (state.is_none() || v.state == state)
                    && v.species == species
                    && v.review != Review::Rejected
            })
            .collect()
    }

    /// The first value of `quantity` for `species` (any source).
    pub fn first(
        &self,
        quantity: ThermoQuantity,
        state: Option<ThermoState>,
        species: &str,
    ) -> Option<&ThermoValue> {
        self.find(quantity, state, species).into_iter().next()
    }

    /// The n-th ionisation energy of `species`.
    pub fn ionisation(&self, species: &str, stage: u8) -> Option<&ThermoValue> {
        self.find(ThermoQuantity::Ionisation, None, species)
            .into_iter()
            .find(|v| v.stage == Some(stage))
    }

    /// Laliberté's heat-capacity coefficients for the solute of this formula.
    pub fn heat_capacity_of(&self, formula: &str) -> Option<&HeatCapacityFit> {
        self.heat_capacity
            .iter()
            .find(|h| h.solute == formula && h.review != Review::Rejected)
    }
}
